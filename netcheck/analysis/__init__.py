"""Circuit analysis: pure functions, one module per topic."""
