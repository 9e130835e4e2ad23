// Package batch annotates every workbook below a folder into a mirror
// folder: in parallel, one file never stopping the others, each output
// written atomically, already up-to-date outputs skipped, and a
// deterministic share of the files per shard so that a job array on a
// scheduler can spread a large conversion over many machines.
//
// The annotation itself is passed in (Config.Annotate), so that this
// package knows nothing of workbooks and the caller decides the rules,
// packs and limits.
package batch
