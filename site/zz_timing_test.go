package site

import (
	"fmt"
	"testing"

	"github.com/chromedp/chromedp"
)

func TestZZTiming(t *testing.T) {
	for i := 0; i < 3; i++ {
		s := browser(t)
		var out string
		err := chromedp.Run(s.ctx,
			chromedp.Navigate(s.base+"/"),
			chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
			chromedp.Evaluate(`"phases " + JSON.stringify(lotlens.loadPhases()) + " ready " + document.body.dataset.readyMs`, &out))
		if err != nil {
			t.Fatal(err)
		}
		fmt.Println(out)
	}
}
