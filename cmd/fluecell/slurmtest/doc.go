// Package slurmtest proves fluecell batch --shard on a real scheduler: its
// test starts a one-node Slurm cluster (munged, slurmctld, slurmd) in a
// temporary folder, runs a job array of batch shards over one input folder
// into one shared output folder, and merges the shards' summaries with
// fluecell batch-merge.
//
// The daemons run as the user running the test (root is not needed) and
// every file they use lies below a temporary folder. The test skips when
// Slurm or munge is not installed (Debian packages slurm-wlm and munge);
// with FLUECELL_REQUIRE_SLURM=1, as CI sets it, it fails instead.
package slurmtest
