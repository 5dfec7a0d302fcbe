package classify

import "testing"

// BenchmarkLogisticFitSmall times one fit at the size of a bootstrap
// refit's fold on 20,000 records (16,000 training rows) with 4 features,
// the width of a typical mechanism's (node, parents) columns:
//
//	go test ./attribution/classify -run '^$' -bench LogisticFitSmall -benchtime 200x
func BenchmarkLogisticFitSmall(b *testing.B) {
	x, y, _ := interactionData(16000, 4, 1)
	for _, l := range []Learner{NewLinear(), NewExpanded()} {
		b.Run(l.Name(), func(b *testing.B) {
			l := l.(Threaded).WithThreads(1)
			for b.Loop() {
				if _, err := l.Fit(x, y, nil, 1); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
