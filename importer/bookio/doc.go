// Package bookio reads and writes the .xlsx/.xlsm package of a workbook as
// a stream, knowing nothing of what the cells mean.
//
// Reading: Open checks the package with size limits per kind of part
// (zip-bomb protection, PartLimit) and reads its sheet list and shared
// strings; Book.OpenSheet streams a worksheet's rows as typed cells (the
// usual shapes of cell read straight from the buffer, the rest token by
// token) and then, if asked, its merged ranges (SheetReader.Merges;
// Book.ReadMerges finds them beforehand, at the cost of inflating the part
// once more); Tok is the small XML pull tokenizer underneath, which
// allocates nothing per token.
//
// Writing: a Writer copies the package part by part into a new zip. Parts
// that do not change are copied as their raw compressed bytes (no inflate,
// no deflate); RewriteSheet streams a worksheet through, appending cells to
// its rows and changing the style of marked cells, with the rest of the
// part kept byte for byte; Splice adds the sheets of another (small)
// package, with their drawings and charts; AddComments gives a sheet cell
// comments. Memory stays bounded by the tokenizer's and the compressor's
// buffers, whatever the size of the sheet.
package bookio
