package batch

import (
	"fmt"
	"hash/fnv"
	"strconv"
	"strings"
)

// Shard selects a deterministic, disjoint part of the files: shard Index of
// Count, numbered from 1. The zero Shard takes every file.
type Shard struct {
	Index, Count int
}

// ParseShard reads "I/N" with 1 <= I <= N.
func ParseShard(s string) (Shard, error) {
	is, ns, ok := strings.Cut(strings.TrimSpace(s), "/")
	i, err1 := strconv.Atoi(strings.TrimSpace(is))
	n, err2 := strconv.Atoi(strings.TrimSpace(ns))
	if !ok || err1 != nil || err2 != nil {
		return Shard{}, fmt.Errorf("shard %q: write I/N, e.g. 3/8 for the third of eight shards", s)
	}
	if n < 1 || n > 1_000_000 {
		return Shard{}, fmt.Errorf("shard %q: N must be between 1 and 1000000", s)
	}
	if i == 0 {
		return Shard{}, fmt.Errorf("shard %q: shards are numbered from 1 to %d; for a 0-based index such as a Kubernetes JOB_COMPLETION_INDEX write $((JOB_COMPLETION_INDEX+1))/%d", s, n, n)
	}
	if i < 1 || i > n {
		return Shard{}, fmt.Errorf("shard %q: I must be between 1 and %d", s, n)
	}
	return Shard{Index: i, Count: n}, nil
}

// Takes reports whether the shard takes the file at the slash-separated
// relative path rel. The choice depends on rel alone, so it does not change
// when other files are added or removed.
func (s Shard) Takes(rel string) bool {
	if s.Count <= 1 {
		return true
	}
	h := fnv.New64a()
	h.Write([]byte(rel))
	return int(h.Sum64()%uint64(s.Count)) == s.Index-1
}

func (s Shard) String() string {
	if s.Count <= 1 {
		return "all"
	}
	return strconv.Itoa(s.Index) + "/" + strconv.Itoa(s.Count)
}
