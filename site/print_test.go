package site

// The print as a record (issue 14): the demo with a target, limits and a
// reading left out with a reason is printed to PDF on A4 and on Letter, and
// the PDF's text (Debian's poppler-utils pdftotext, installed by `make
// deps-browser`) must hold every figure the screen shows, those in sections
// folded away on screen included, the report's date with its time zone and
// the exclusions with their reasons.

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
)

// pdfText is the text of a PDF as pdftotext reads it, with every run of
// white space (no-break spaces included) made one space.
func pdfText(t *testing.T, pdf []byte) string {
	t.Helper()
	exe, err := exec.LookPath("pdftotext")
	if err != nil {
		t.Fatal("the print test reads the PDF with pdftotext: run  make deps-browser  (or apt-get install poppler-utils)")
	}
	in := filepath.Join(t.TempDir(), "print.pdf")
	if err := os.WriteFile(in, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(exe, "-enc", "UTF-8", in, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	return oneSpace(string(out))
}

var spaces = regexp.MustCompile(`[\s\x{00a0}\x{202f}]+`)

func oneSpace(s string) string { return strings.TrimSpace(spaces.ReplaceAllString(s, " ")) }

// shownFigure is one element of class "num" in the report's cards.
type shownFigure struct {
	Card   string `json:"card"`
	Field  string `json:"field"`
	Text   string `json:"text"`
	Folded bool   `json:"folded"` // inside a section closed on screen
}

func TestPrintHoldsEveryFigure(t *testing.T) {
	s := browser(t)
	// A zone east of UTC with a half-hour offset and no daylight saving, so
	// the printed offset cannot be mistaken for UTC or a whole-hour zone.
	const zone, offset, zoneWords = "Asia/Kolkata", "+05:30", "GMT+5:30"
	kolkata, err := time.LoadLocation(zone)
	if err != nil {
		t.Fatal(err)
	}
	s.run(t, emulation.SetTimezoneOverride(zone))
	s.open(t)
	const reason = "capsule cracked at the weigh station"
	s.run(t, chromedp.Click("#demo", chromedp.ByID), analysed(1),
		setField("target", "5.10"), setField("lsl", "4.95"), setField("usl", "5.25"), setField("leave-out", "10"),
		chromedp.Poll(`!!document.querySelector("#card-spec:not(.placeholder) .spec-statement") && !!document.querySelector('input.reason[data-reason-row="10"]')`, nil,
			chromedp.WithPollingTimeout(30*time.Second)),
		setField("reason-10", reason))
	s.state(t)
	day := time.Now().In(kolkata)

	var figs []shownFigure
	var rowText, headText string
	s.eval(t, `[...document.querySelectorAll("#cards .card .num")].map((e) => ({
		card: e.closest(".card").id, field: e.dataset.field || "", text: e.textContent,
		folded: !!e.closest("details:not([open])") }))`, &figs)
	s.eval(t, `document.querySelector('[data-row-out="10"] .out-what').textContent`, &rowText)
	s.eval(t, `document.getElementById("print-head").textContent`, &headText)
	folded := 0
	for _, f := range figs {
		if f.Folded {
			folded++
		}
	}
	if len(figs) < 40 || folded < 10 {
		t.Fatalf("the demo shows %d figures, %d of them in folded sections: too few for this test to mean anything", len(figs), folded)
	}

	for _, paper := range []struct {
		name string
		w, h float64
		max  int
	}{{"A4", 8.27, 11.69, 5}, {"Letter", 8.5, 11, 5}} { // every figure of every card, the spec card with capability, fits and tolerance intervals included
		t.Run(paper.name, func(t *testing.T) {
			var pdf []byte
			s.run(t, chromedp.ActionFunc(func(ctx context.Context) error {
				var err error
				pdf, _, err = page.PrintToPDF().WithPaperWidth(paper.w).WithPaperHeight(paper.h).Do(ctx)
				return err
			}))
			save(t, "12-print-record-"+strings.ToLower(paper.name)+".pdf", pdf)
			pages := bytes.Count(pdf, []byte("/Type /Page")) - bytes.Count(pdf, []byte("/Type /Pages"))
			t.Logf("%s: %d pages, %d figures checked (%d folded on screen)", paper.name, pages, len(figs), folded)
			if pages < 1 || pages > paper.max {
				t.Errorf("the demo with target and limits prints on %d %s pages, want at most %d", pages, paper.name, paper.max)
			}
			text := pdfText(t, pdf)

			// Every figure, as a whole number token (not part of a longer one).
			missing := 0
			for _, f := range figs {
				want := oneSpace(f.Text)
				re := regexp.MustCompile(`(?:^|[^\d.,])` + regexp.QuoteMeta(want) + `(?:[^\d]|$)`)
				if !re.MatchString(text) {
					missing++
					t.Errorf("figure %q (%s, data-field %q, folded on screen %v) is not in the printed text", want, f.Card, f.Field, f.Folded)
				}
			}

			// The date with its time and time zone, in words and as ISO 8601.
			iso := regexp.MustCompile(`\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d` + regexp.QuoteMeta(offset) + `, Asia/(Kolkata|Calcutta)`) // ICU may give the older name
			m := iso.FindString(text)
			if m == "" || !strings.Contains(text, zoneWords) {
				t.Errorf("the print lacks the date and time with the zone (%s, %s)", offset, zoneWords)
			} else if d := day.Format("2006-01-02"); !strings.HasPrefix(m, d) && !strings.HasPrefix(m, time.Now().In(kolkata).Format("2006-01-02")) {
				t.Errorf("printed date %s, want %s in %s", m, d, zone)
			}

			// Who left out what and why: the header and the card.
			value := strings.TrimSpace(strings.TrimPrefix(oneSpace(rowText), "Row 10:"))
			line := "row 10 (" + strings.Fields(value)[0] + "; reason: " + reason + ")"
			if !strings.Contains(text, "Left out by the user: "+line) {
				t.Errorf("the print header lacks %q (on screen: %q)", line, oneSpace(headText))
			}
			if !strings.Contains(text, "Reason: "+reason) {
				t.Errorf("the suspect-readings card prints no %q", "Reason: "+reason)
			}
			if !strings.Contains(text, "Made and readings left out by") {
				t.Error("the print has no line for the name of who made the report")
			}
			if missing > 0 || t.Failed() {
				os.WriteFile(filepath.Join(artefacts, "12-print-record-"+strings.ToLower(paper.name)+".txt"), []byte(text), 0o644)
			}
		})
	}
}
