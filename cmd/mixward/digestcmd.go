package main

// mixward digest: the shift handover summary of the query log.

import (
	"context"
	"fmt"
	"io"
	"text/tabwriter"
	"time"

	"mixward/store"
)

func (a *app) cmdDigest(ctx context.Context, args []string) error {
	fs := subFlags(a, "digest", "digest [--since DATE] [--until DATE] [--format text|json] [--shifts SPEC] [--sent]", `
Summarise a period of the query log for the shift handover: how many
queries and who asked, verdict counts, every spontaneous mix with a danger
or warning hazard (who, when, request, hazard), requests that did not
parse, and the most-asked stream pairs. Without --since and --until it is
the shift that ended last, by the shift changes in --shifts (a 5-field cron
spec in the site time zone). With --since alone the period runs to now.
This prints the digest; it does not record or post it (the bot and the
console do that at each shift change). --sent lists the digests they sent.
The file is only read, never created or changed. The digest ends with the
log's head hash at the end of the period: keep it, and check it later with
'mixward log verify --expect HASH'.

`+dateHelp)
	o := storeFlags(a, fs)
	since := fs.String("since", "", "start of the period (`date`, included)")
	until := fs.String("until", "", "end of the period (`date`, excluded); needs --since")
	format := fs.String("format", "text", "output `format`: text or json")
	shifts := fs.String("shifts", shiftSpec(a), "shift-change `spec` (cron, site time zone) for the default period (env MIXWARD_SHIFTS)")
	sent := fs.Bool("sent", false, "list the scheduled digests recorded as sent, newest first, instead")
	if err := parseNoArgs(fs, args, "digest", "text", "json"); err != nil {
		return err
	}
	loc, err := siteLocation(o.tz)
	if err != nil {
		return err
	}
	var from, to time.Time
	switch {
	case *since == "" && *until != "":
		return usageErr("digest: --until needs --since")
	case *since == "":
		sched, err := store.ParseShifts(*shifts)
		if err != nil {
			return usageErr("--shifts: %v", err)
		}
		if from, to, err = store.LastShift(sched, loc, time.Now()); err != nil {
			return usageErr("--shifts: %v", err)
		}
	default:
		if from, err = parseWhen("since", *since, loc); err != nil {
			return err
		}
		to = time.Now()
		if *until != "" {
			if to, err = parseWhen("until", *until, loc); err != nil {
				return err
			}
		}
		if !from.Before(to) {
			return usageErr("digest: --since %s is not before the end %s", local(from, loc), local(to, loc))
		}
	}
	db, loc, err := openReadDB(ctx, a, o, false)
	if err != nil {
		return err
	}
	defer db.Close()
	if *sent {
		return a.digestsSent(ctx, db, loc, *format)
	}
	d, err := db.Digest(ctx, from, to)
	if err != nil {
		return err
	}
	if *format == "json" {
		b, err := d.JSON()
		if err != nil {
			return err
		}
		_, err = a.stdout.Write(b)
		return err
	}
	_, err = io.WriteString(a.stdout, d.Text())
	return err
}

func (a *app) digestsSent(ctx context.Context, db digestRecords, loc *time.Location, format string) error {
	recs, err := db.DigestRecords(ctx, 100)
	if err != nil {
		return err
	}
	if format == "json" {
		return writeJSON(a.stdout, recs)
	}
	if len(recs) == 0 {
		fmt.Fprintln(a.stdout, "No scheduled digests recorded yet.")
		return nil
	}
	tw := tabwriter.NewWriter(a.stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintf(tw, "SHIFT (%s)\tSTATUS\tATTEMPTS\tAT\tDETAIL\n", loc)
	for _, r := range recs {
		status := r.Status
		if status == "claimed" {
			status = "unknown (stopped while sending)"
		}
		fmt.Fprintf(tw, "%s – %s\t%s\t%d\t%s\t%s\n", local(r.Since, loc), r.Slot.In(loc).Format("15:04 MST"), status,
			r.Attempts, local(r.ClaimedAt, loc), safeCut(r.Detail, 60))
	}
	return tw.Flush()
}
