package store

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

func TestBackupAndRestore(t *testing.T) {
	c := newClock(t0)
	db, _ := mustOpen(t, c.Now)
	ctx := context.Background()
	logN(t, db, c, 20)
	if err := db.SetStream(ctx, "T-101", "200 L NaOCl 12.5 %", "", "op.north"); err != nil {
		t.Fatal(err)
	}

	// Back up while another goroutine keeps logging.
	dir := t.TempDir()
	bak := filepath.Join(dir, "backup.db")
	var wg sync.WaitGroup
	stop := make(chan struct{})
	wg.Add(1)
	go func() {
		defer wg.Done()
		for {
			select {
			case <-stop:
				return
			default:
				if _, err := db.LogQuery(ctx, demoQuery()); err != nil {
					t.Error(err)
					return
				}
			}
		}
	}()
	err := db.Backup(ctx, bak)
	close(stop)
	wg.Wait()
	if err != nil {
		t.Fatal(err)
	}
	rep, err := VerifyFile(ctx, bak)
	if err != nil || !rep.OK || rep.Queries < 20 {
		t.Fatalf("VerifyFile(backup) = %+v, %v", rep, err)
	}
	if err := db.Backup(ctx, bak); err == nil || !strings.Contains(err.Error(), "already exists") {
		t.Errorf("Backup over an existing file = %v, want refusal", err)
	}

	// Restore into a new, empty database.
	fresh, err := Open(ctx, filepath.Join(dir, "restored.db"), Options{Now: c.Now})
	if err != nil {
		t.Fatal(err)
	}
	defer fresh.Close()
	rrep, err := fresh.Restore(ctx, bak)
	if err != nil || !rrep.OK || rrep.Queries != rep.Queries || rrep.HeadHash != rep.HeadHash {
		t.Fatalf("Restore = %+v, %v; want the backup's %d queries, head %s", rrep, err, rep.Queries, rep.HeadHash)
	}
	if s, err := fresh.Stream(ctx, "T-101"); err != nil || s.Stream != "200 L NaOCl 12.5 %" {
		t.Errorf("restored catalogue: %+v, %v", s, err)
	}
	if page, err := fresh.Search(ctx, SearchOptions{Terms: "T-105"}); err != nil || len(page.Queries) != 1 {
		t.Errorf("search in restored db: %d rows, %v", len(page.Queries), err)
	}
	// Logging continues on the restored chain.
	mustLog(t, fresh, demoQuery())
	if rep, _ := fresh.Verify(ctx); !rep.OK {
		t.Errorf("Verify after logging on restored db = %+v", rep)
	}
}

func TestRestoreRefusesBrokenBackup(t *testing.T) {
	c := newClock(t0)
	db, _ := mustOpen(t, c.Now)
	ctx := context.Background()
	logN(t, db, c, 5)
	bak := filepath.Join(t.TempDir(), "backup.db")
	if err := db.Backup(ctx, bak); err != nil {
		t.Fatal(err)
	}
	if _, err := rawDB(t, bak).Exec(`UPDATE queries SET verdict = 'no-reaction' WHERE id = 2`); err != nil {
		t.Fatal(err)
	}
	target, _ := mustOpen(t, c.Now)
	mustLog(t, target, demoQuery())
	rep, err := target.Restore(ctx, bak)
	if !errors.Is(err, ErrBrokenChain) || rep.BrokenID != 2 {
		t.Fatalf("Restore(tampered) = %+v, %v; want ErrBrokenChain at row 2", rep, err)
	}
	if n, _ := target.Count(ctx); n != 1 {
		t.Errorf("target has %d queries after a refused restore, want its 1", n)
	}
	notDB := filepath.Join(t.TempDir(), "notes.txt")
	os.WriteFile(notDB, []byte("shift notes"), 0o644)
	if _, err := target.Restore(ctx, notDB); err == nil {
		t.Error("Restore(not a database) succeeded")
	}
}

func TestRestoreOlderBackup(t *testing.T) {
	ctx := context.Background()
	c := newClock(t0)
	oldPath := filepath.Join(t.TempDir(), "v1.db")
	old, err := openAt(ctx, oldPath, Options{Now: c.Now}, 1)
	if err != nil {
		t.Fatal(err)
	}
	logAsVersion(t, old, demoQuery(), 1)
	old.Close()
	target, _ := mustOpen(t, c.Now)
	rep, err := target.Restore(ctx, oldPath)
	if err != nil || !rep.OK || rep.Queries != 1 {
		t.Fatalf("Restore(v1 file) = %+v, %v", rep, err)
	}
	if v, _ := target.Version(ctx); v != SchemaVersion() {
		t.Errorf("restored version %d, want migrated to %d", v, SchemaVersion())
	}
	if page, _ := target.Search(ctx, SearchOptions{Terms: "HCl"}); len(page.Queries) != 1 {
		t.Errorf("restored v1 rows not searchable: %d", len(page.Queries))
	}
}
