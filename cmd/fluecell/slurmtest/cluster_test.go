package slurmtest

import (
	"bytes"
	"context"
	"fmt"
	"net"
	"os"
	"os/exec"
	"os/user"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

// requireEnv makes a missing prerequisite a failure instead of a skip.
const requireEnv = "FLUECELL_REQUIRE_SLURM"

// installHint says how to get what the test needs.
const installHint = "install them with: apt-get install -y --no-install-recommends slurm-wlm munge"

// unavailable skips the test, or fails it when FLUECELL_REQUIRE_SLURM=1.
func unavailable(t *testing.T, format string, args ...any) {
	t.Helper()
	msg := fmt.Sprintf(format, args...)
	if os.Getenv(requireEnv) == "1" {
		t.Fatalf("%s (%s=1 makes this a failure)", msg, requireEnv)
	}
	t.Skipf("%s (set %s=1 to make this a failure)", msg, requireEnv)
}

// slurmTools finds the programs the cluster needs; daemons live in
// /usr/sbin, which an ordinary user's PATH may lack.
func slurmTools(t *testing.T) map[string]string {
	t.Helper()
	paths := map[string]string{}
	var missing []string
	for _, name := range []string{"munged", "mungekey", "slurmctld", "slurmd", "sbatch", "sinfo"} {
		p, err := exec.LookPath(name)
		if err != nil {
			for _, dir := range []string{"/usr/sbin", "/sbin", "/usr/bin"} {
				if fi, err := os.Stat(filepath.Join(dir, name)); err == nil && fi.Mode()&0o111 != 0 {
					p = filepath.Join(dir, name)
					break
				}
			}
		}
		if p == "" {
			missing = append(missing, name)
		}
		paths[name] = p
	}
	if len(missing) > 0 {
		unavailable(t, "a one-node Slurm cluster needs %s, not found; %s", strings.Join(missing, ", "), installHint)
	}
	return paths
}

// cluster is a one-node Slurm cluster whose every file (key, sockets,
// state, spool, logs) lies below dir.
type cluster struct {
	t     *testing.T
	dir   string
	conf  string
	node  string
	user  string // runs the daemons and the jobs
	tools map[string]string
	procs []*daemon
}

// daemon is one started daemon; done is closed when it has exited.
type daemon struct {
	name string
	cmd  *exec.Cmd
	done chan struct{}
}

// freePort asks the kernel for a TCP port that is free now.
func freePort(t *testing.T) int {
	t.Helper()
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}

// startCluster starts munged, slurmctld and slurmd below a temporary
// folder and waits until the node is idle. The daemons are stopped when
// the test ends.
func startCluster(t *testing.T, tools map[string]string) *cluster {
	t.Helper()
	// A unix socket path holds at most 107 bytes: keep the folder short.
	base := os.TempDir()
	if len(base) > 40 {
		base = "/tmp"
	}
	dir, err := os.MkdirTemp(base, "fluecell-slurm-")
	if err != nil {
		t.Fatal(err)
	}
	c := &cluster{t: t, dir: dir, conf: filepath.Join(dir, "slurm.conf"), tools: tools}
	t.Cleanup(func() {
		c.stop()
		if !t.Failed() {
			os.RemoveAll(dir)
		} else {
			t.Logf("cluster folder kept for inspection: %s", dir)
		}
	})
	for _, sub := range []string{"munge", "state", "spool", "log", "work"} {
		if err := os.MkdirAll(filepath.Join(dir, sub), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	// munged refuses a socket folder that others cannot enter (mode 700).
	for _, d := range []string{dir, filepath.Join(dir, "munge")} {
		if err := os.Chmod(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	key := filepath.Join(dir, "munge", "munge.key")
	if out, err := exec.Command(tools["mungekey"], "-c", "-k", key).CombinedOutput(); err != nil {
		t.Fatalf("mungekey: %v\n%s", err, out)
	}
	c.start("munged", tools["munged"], "-F", "--key-file="+key, "--socket="+c.socket(),
		"--pid-file="+filepath.Join(dir, "munge", "munged.pid"), "--seed-file="+filepath.Join(dir, "munge", "munged.seed"),
		"--log-file="+filepath.Join(dir, "log", "munged.log"))
	c.waitFor("munged's socket", 10*time.Second, func() (bool, string) {
		_, err := os.Stat(c.socket())
		return err == nil, ""
	})

	me, err := user.Current()
	if err != nil {
		t.Fatal(err)
	}
	c.user = me.Username
	host, err := os.Hostname()
	if err != nil {
		t.Fatal(err)
	}
	c.node, _, _ = strings.Cut(host, ".")
	out, err := exec.Command(tools["slurmd"], "-C").Output()
	if err != nil {
		t.Fatalf("slurmd -C: %v", err)
	}
	cpus, mem := nodeSize(string(out))
	if err := os.WriteFile(c.conf, []byte(c.config(cpus, mem, freePort(t), freePort(t))), 0o644); err != nil {
		t.Fatal(err)
	}
	c.start("slurmctld", tools["slurmctld"], "-D", "-f", c.conf)
	c.start("slurmd", tools["slurmd"], "-D", "-f", c.conf, "-N", c.node)
	c.waitFor("the node to be idle", 60*time.Second, func() (bool, string) {
		out, _ := c.command(tools["sinfo"], "-h", "-N", "-o", "%T").CombinedOutput()
		s := strings.TrimSpace(string(out))
		return s == "idle", "sinfo -h -N -o %T: " + s
	})
	return c
}

// nodeSize reads CPUs and RealMemory from slurmd -C.
func nodeSize(s string) (cpus, mem int) {
	cpus, mem = 1, 1000
	for _, f := range strings.Fields(s) {
		k, v, _ := strings.Cut(f, "=")
		n, err := strconv.Atoi(v)
		if err != nil || n <= 0 {
			continue
		}
		switch k {
		case "CPUs":
			cpus = n
		case "RealMemory":
			mem = n
		}
	}
	return cpus, mem
}

func (c *cluster) socket() string { return filepath.Join(c.dir, "munge", "munge.socket") }

// config is slurm.conf for one node, without cgroups or accounting. Both
// daemons run as the user running the test, root or not: slurmd then
// starts jobs of that user alone, which is all the test submits.
func (c *cluster) config(cpus, mem, ctldPort, slurmdPort int) string {
	d := c.dir
	return fmt.Sprintf(`ClusterName=fluecelltest
SlurmctldHost=%[2]s(127.0.0.1)
SlurmctldPort=%[3]d
SlurmdPort=%[4]d
SlurmUser=%[7]s
SlurmdUser=%[7]s
AuthType=auth/munge
AuthInfo=socket=%[1]s/munge/munge.socket
CredType=cred/munge
MpiDefault=none
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
ReturnToService=2
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MailProg=/bin/true
StateSaveLocation=%[1]s/state
SlurmdSpoolDir=%[1]s/spool
SlurmctldPidFile=%[1]s/state/slurmctld.pid
SlurmdPidFile=%[1]s/spool/slurmd.pid
SlurmctldLogFile=%[1]s/log/slurmctld.log
SlurmdLogFile=%[1]s/log/slurmd.log
NodeName=%[2]s NodeAddr=127.0.0.1 CPUs=%[5]d RealMemory=%[6]d State=UNKNOWN
PartitionName=debug Nodes=%[2]s Default=YES MaxTime=INFINITE State=UP
`, d, c.node, ctldPort, slurmdPort, cpus, mem, c.user)
}

// env is the environment of every Slurm command: this cluster's
// configuration.
func (c *cluster) env() []string { return append(os.Environ(), "SLURM_CONF="+c.conf) }

// command prepares a client command (sinfo, sbatch) against this cluster.
func (c *cluster) command(name string, args ...string) *exec.Cmd {
	return c.commandContext(context.Background(), name, args...)
}

// commandContext is command, killed when ctx ends.
func (c *cluster) commandContext(ctx context.Context, name string, args ...string) *exec.Cmd {
	cmd := exec.CommandContext(ctx, name, args...)
	cmd.Env = c.env()
	cmd.Dir = filepath.Join(c.dir, "work")
	return cmd
}

// start runs a daemon in the foreground of its own process group, its
// output to log/NAME.out.
func (c *cluster) start(name, path string, args ...string) {
	c.t.Helper()
	out, err := os.Create(filepath.Join(c.dir, "log", name+".out"))
	if err != nil {
		c.t.Fatal(err)
	}
	defer out.Close()
	cmd := exec.Command(path, args...)
	cmd.Env = c.env()
	cmd.Dir = c.dir
	cmd.Stdout, cmd.Stderr = out, out
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	if err := cmd.Start(); err != nil {
		c.t.Fatalf("starting %s: %v", name, err)
	}
	d := &daemon{name: name, cmd: cmd, done: make(chan struct{})}
	go func() { cmd.Wait(); close(d.done) }()
	c.procs = append(c.procs, d)
}

// waitFor polls ready until it holds or the timeout passes; on timeout the
// test fails with the last state and the daemons' logs.
func (c *cluster) waitFor(what string, timeout time.Duration, ready func() (bool, string)) {
	c.t.Helper()
	deadline := time.Now().Add(timeout)
	var last string
	for time.Now().Before(deadline) {
		var ok bool
		if ok, last = ready(); ok {
			return
		}
		for _, d := range c.procs {
			select {
			case <-d.done:
				c.t.Fatalf("%s exited (%v) while waiting for %s\n%s", d.name, d.cmd.ProcessState, what, c.logs())
			default:
			}
		}
		time.Sleep(200 * time.Millisecond)
	}
	c.t.Fatalf("waited %v for %s; %s\n%s", timeout, what, last, c.logs())
}

// logs returns the end of every log of the cluster, for failure messages.
func (c *cluster) logs() string {
	var b bytes.Buffer
	files, _ := filepath.Glob(filepath.Join(c.dir, "log", "*"))
	for _, f := range files {
		data, _ := os.ReadFile(f)
		if len(data) > 4000 {
			data = data[len(data)-4000:]
		}
		fmt.Fprintf(&b, "---- %s\n%s\n", f, data)
	}
	return b.String()
}

// stop ends the daemons, newest first (slurmd, slurmctld, munged): SIGTERM
// to each one's process group, SIGKILL after 10 s; then any process still
// running with this cluster's configuration in its environment (a job or
// job step left behind).
func (c *cluster) stop() {
	for i := len(c.procs) - 1; i >= 0; i-- {
		d := c.procs[i]
		pgid := d.cmd.Process.Pid
		syscall.Kill(-pgid, syscall.SIGTERM)
		select {
		case <-d.done:
		case <-time.After(10 * time.Second):
			c.t.Logf("%s did not stop within 10 s of SIGTERM: killed", d.name)
			syscall.Kill(-pgid, syscall.SIGKILL)
			<-d.done
		}
		syscall.Kill(-pgid, syscall.SIGKILL) // children left in the group
	}
	c.procs = nil
	for _, pid := range c.stragglers() {
		c.t.Logf("killing process %d left by the cluster", pid)
		syscall.Kill(pid, syscall.SIGKILL)
	}
}

// stragglers lists the processes whose environment names this cluster's
// slurm.conf: jobs and job steps, which detach from slurmd.
func (c *cluster) stragglers() []int {
	mark := []byte("SLURM_CONF=" + c.conf + "\x00")
	ents, _ := os.ReadDir("/proc")
	var pids []int
	for _, e := range ents {
		pid, err := strconv.Atoi(e.Name())
		if err != nil || pid == os.Getpid() {
			continue
		}
		env, err := os.ReadFile(filepath.Join("/proc", e.Name(), "environ"))
		if err == nil && bytes.Contains(env, mark) {
			pids = append(pids, pid)
		}
	}
	return pids
}

// sbatch submits a job and waits for it (--wait) within the context's
// deadline.
func (c *cluster) sbatch(ctx context.Context, args ...string) (string, error) {
	out, err := c.commandContext(ctx, c.tools["sbatch"], args...).CombinedOutput()
	return string(out), err
}
