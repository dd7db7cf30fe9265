// Package pgtest starts a throwaway PostgreSQL 15 server with PostGIS for tests: a cluster
// made by initdb in a test's temporary folder, listening on a unix socket only, stopped and
// removed when the test ends, whether it passes or fails. It needs Debian's postgresql-15 and
// postgresql-15-postgis-3; without them a test is skipped, or fails when CI=true.
package pgtest

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"os/user"
	"path/filepath"
	"strconv"
	"testing"
	"time"
)

// BinDir is where Debian installs the PostgreSQL 15 server programs.
const BinDir = "/usr/lib/postgresql/15/bin"

// Need returns the path of a reference tool, or skips the test without it (fails it when
// CI=true: .ci/run installs the Debian package named).
func Need(t testing.TB, tool, pkg string) string {
	t.Helper()
	p, err := exec.LookPath(tool)
	if err != nil {
		if filepath.IsAbs(tool) {
			if _, serr := os.Stat(tool); serr == nil {
				return tool
			}
		}
		if os.Getenv("CI") == "true" {
			t.Fatalf("%s not found; CI installs %s", tool, pkg)
		}
		t.Skipf("%s not found (apt-get install %s); skipping", tool, pkg)
	}
	return p
}

// Server is a running throwaway cluster.
type Server struct {
	Socket string // the folder of its unix socket: the host of a connection string
	User   string // its superuser, who connects without a password (trust)
	Port   int
}

// ConnString is the libpq key=value connection string of the database dbname.
func (s *Server) ConnString(dbname string) string {
	return fmt.Sprintf("host=%s port=%d user=%s dbname=%s sslmode=disable", s.Socket, s.Port, s.User, dbname)
}

// PGSource is the connection as GDAL's PostgreSQL driver names it (ogr2ogr -f PostgreSQL).
func (s *Server) PGSource(dbname string) string { return "PG:" + s.ConnString(dbname) }

// Start makes a cluster in a temporary folder of t and starts it. Run as root, the server runs
// as the user "postgres" (Debian's postgresql-common makes it) or else "nobody", since
// PostgreSQL refuses to run as root.
func Start(t testing.TB) *Server {
	t.Helper()
	initdb := Need(t, filepath.Join(BinDir, "initdb"), "postgresql-15")
	pgctl := Need(t, filepath.Join(BinDir, "pg_ctl"), "postgresql-15")
	if _, err := os.Stat("/usr/share/postgresql/15/extension/postgis.control"); err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatal("PostGIS for PostgreSQL 15 not found; CI installs postgresql-15-postgis-3")
		}
		t.Skip("PostGIS for PostgreSQL 15 not found (apt-get install postgresql-15-postgis-3); skipping")
	}
	dir := t.TempDir()
	run := func(name string, args ...string) *exec.Cmd { return exec.Command(name, args...) }
	if os.Geteuid() == 0 {
		u, err := user.Lookup("postgres")
		if err != nil {
			u, err = user.Lookup("nobody")
		}
		if err != nil {
			t.Fatalf("running as root and no user postgres or nobody to run the server as: %v", err)
		}
		uid, _ := strconv.Atoi(u.Uid)
		gid, _ := strconv.Atoi(u.Gid)
		// The test's temporary folders are root's and private: let the server's user in.
		for _, d := range []string{filepath.Dir(dir), dir} {
			if err := os.Chmod(d, 0o755); err != nil {
				t.Fatal(err)
			}
		}
		if err := os.Chown(dir, uid, gid); err != nil {
			t.Fatal(err)
		}
		runuser := Need(t, "runuser", "util-linux")
		run = func(name string, args ...string) *exec.Cmd {
			return exec.Command(runuser, append([]string{"-u", u.Username, "--", name}, args...)...)
		}
	}
	data := filepath.Join(dir, "data")
	s := &Server{Socket: dir, User: "spanwright", Port: 5432}
	if out, err := run(initdb, "-D", data, "-U", s.User, "--auth=trust", "-E", "UTF8", "--no-sync", "--no-instructions").CombinedOutput(); err != nil {
		t.Fatalf("initdb: %v\n%s", err, out)
	}
	// Stopped even when the test fails after this point; t.TempDir's own clean-up, registered
	// earlier, runs after this one and removes the cluster.
	t.Cleanup(func() {
		if out, err := run(pgctl, "stop", "-D", data, "-m", "immediate", "-w").CombinedOutput(); err != nil {
			t.Logf("pg_ctl stop: %v\n%s", err, out)
		}
	})
	opts := fmt.Sprintf("-c listen_addresses='' -k %s -p %d -c fsync=off -c full_page_writes=off", dir, s.Port)
	log := filepath.Join(dir, "server.log")
	if out, err := run(pgctl, "start", "-D", data, "-w", "-t", "60", "-l", log, "-o", opts).CombinedOutput(); err != nil {
		logText, _ := os.ReadFile(log)
		t.Fatalf("pg_ctl start: %v\n%s\n%s", err, out, logText)
	}
	return s
}

// Timeout bounds a test's exchange with the server.
const Timeout = 60 * time.Second

// Context is a context that ends with the test or after Timeout.
func Context(t testing.TB) context.Context {
	ctx, cancel := context.WithTimeout(context.Background(), Timeout)
	t.Cleanup(cancel)
	return ctx
}
