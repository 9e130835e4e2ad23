package batch

import (
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"strings"

	"github.com/fluecell/fluecell/importer/atomicfile"
)

// removeStaleTemps deletes the temporary files a killed run left in the
// output folder (".name.xlsx.123.tmp" beside name.xlsx, see
// atomicfile.TempPattern) and in its stamp folder, for this shard's files
// only: other shards may be writing theirs into the same folder. A
// temporary output belongs to the input that gives that output (one of
// files), else to the input of the same name; the temporary file of a name
// too long to keep whole belongs to every input whose output begins with
// what it kept, and is removed when all of them are this shard's.
func removeStaleTemps(out string, shard Shard, files []string) {
	outputs := map[string]string{} // output path -> input, relative, slash-separated
	stampFiles := map[string]string{}
	for _, f := range files {
		outputs[OutputName(f)] = f
		stampFiles[stampRel(f)] = f
	}
	stamps := filepath.Join(out, stampDir)
	stampOf := func(name string) (string, bool) {
		return strings.TrimSuffix(name, ".json"), strings.HasSuffix(name, ".json")
	}
	filepath.WalkDir(out, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return nil
		}
		if d.IsDir() {
			if p == stamps {
				removeTemps(stamps, shard, stampFiles, stampOf)
				return filepath.SkipDir
			}
			return nil
		}
		removeTemp(out, p, shard, outputs, func(name string) (string, bool) {
			// A temporary file of no current input's output is taken as a stale
			// output only when this run is the only one writing the folder: the
			// shards of a job array share it, and one shard's summary
			// (summary-3.csv) may be written there while another walks it.
			return name, shard.Count <= 1 && isWorkbook(name)
		})
		return nil
	})
}

// removeTemps removes the stale temporary files below root that belong to
// the shard (see removeTemp).
func removeTemps(root string, shard Shard, owners map[string]string, fallback func(string) (string, bool)) {
	filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			removeTemp(root, p, shard, owners, fallback)
		}
		return nil
	})
}

// removeTemp removes the file at p below root when it is a temporary file
// of atomicfile whose inputs are all the shard's. owners maps the files
// below root (relative, slash-separated) to their inputs; fallback gives
// the input of a file that is not in owners (its name relative to its
// folder in, the input's name out), or false when such a file is none of
// ours.
func removeTemp(root, p string, shard Shard, owners map[string]string, fallback func(string) (string, bool)) {
	name, cut, ok := atomicfile.Owner(filepath.Base(p))
	if !ok {
		return
	}
	dir, err := filepath.Rel(root, filepath.Dir(p))
	if err != nil {
		return
	}
	dir = filepath.ToSlash(dir)
	var inputs []string
	if in, ok := owners[path.Join(dir, name)]; ok {
		inputs = append(inputs, in)
	} else if cut {
		prefix := path.Join(dir, name)
		for f, in := range owners {
			if strings.HasPrefix(f, prefix) && path.Dir(f) == dir {
				inputs = append(inputs, in)
			}
		}
	} else if in, ok := fallback(name); ok {
		inputs = append(inputs, path.Join(dir, in))
	}
	if len(inputs) == 0 {
		return
	}
	for _, in := range inputs {
		if !shard.Takes(in) {
			return
		}
	}
	os.Remove(p)
}
