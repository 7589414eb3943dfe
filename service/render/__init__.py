"""Drawing chart plans with matplotlib's object API (never pyplot): one PDF page per chart."""
