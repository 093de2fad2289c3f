package engine

// FeedOf is what the streams of a request bring before any reaction, in
// mol per species text (excess solids marked with their nominal amount):
// the start of the species-conservation check.
func FeedOf(e *Engine, text string) (map[string]float64, error) {
	req, err := Parse(text, e.Tables, AskOptions{})
	if err != nil {
		return nil, err
	}
	req = readAmounts(req, e.Tables)
	m, err := buildMixture(req, e.Tables)
	if err != nil {
		return nil, err
	}
	if !m.aqueous {
		return nil, nil
	}
	f, err := feedOf(req, e.Tables, e.Tables.Thermo, m)
	if err != nil {
		return nil, err
	}
	out := map[string]float64{}
	for _, st := range f.Streams {
		for _, it := range st.Items {
			out[it.Species.Text] += it.Mol
		}
	}
	return out, nil
}

// ReadNotes is what readAmounts says of a request: how it read the streams'
// amounts, before anything is solved.
func ReadNotes(e *Engine, text string) ([]string, error) {
	req, err := Parse(text, e.Tables, AskOptions{})
	if err != nil {
		return nil, err
	}
	return readAmounts(req, e.Tables).Notes[len(req.Notes):], nil
}
