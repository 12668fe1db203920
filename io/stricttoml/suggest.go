package stricttoml

import "strings"

// unknownKey records a key that the schema does not have under prefix,
// suggesting a close key in the same table or the table where it belongs.
func (w walker) unknownKey(prefix []string, name string, v any, t *Field) {
	path := append(append([]string{}, prefix...), Component(name))
	key := KeyString(path)
	_, isTable := v.(map[string]any)

	where, what := "at the top level", "key"
	if isTable {
		what = "table"
	}
	if len(prefix) > 0 {
		where = "in [" + KeyString(prefix) + "]"
		if base, n, ok := SplitIndex(KeyString(prefix)); ok {
			where = "in the " + Ordinal(n+1) + " [[" + base + "]] (" + KeyString(prefix) + ")"
		}
	}
	names := make([]string, len(t.Fields))
	for i, f := range t.Fields {
		names[i] = f.Name
		switch f.Kind {
		case Tables:
			names[i] = "[[" + f.Name + "]]"
		case Table:
			names[i] = "[" + f.Name + "]"
		}
	}
	msg := "unknown " + what + " " + where
	if s := w.suggestKey(prefix, name, t); s != "" {
		msg += "; did you mean " + s + "?"
		if last := LastComponent(s); last != Component(name) && strings.EqualFold(last, Component(name)) {
			msg += " (keys are case-sensitive)"
		}
	}
	if len(names) > 0 {
		msg += " (known here: " + strings.Join(names, ", ") + ")"
	} else {
		msg += "; this table has no keys"
	}
	value := ""
	if !isTable {
		value = FormatValue(v)
	}
	w.p.Add(key, value, msg)
}

// suggestKey proposes a replacement for an unknown key: a close key of the
// same table, or the same key in another table.
func (w walker) suggestKey(prefix []string, name string, t *Field) string {
	names := make([]string, len(t.Fields))
	for i, f := range t.Fields {
		names[i] = f.Name
	}
	if s := Closest(name, names); s != "" {
		return KeyString(append(append([]string{}, prefix...), Component(s)))
	}
	elsewhere := w.schema.Elsewhere(name)
	if len(elsewhere) == 1 {
		return elsewhere[0]
	}
	return ""
}

// LastComponent returns the last component of a dotted key.
func LastComponent(key string) string {
	if parent := ParentKey(key); parent != "" {
		return key[len(parent)+1:]
	}
	return key
}

// Closest returns the candidate nearest to s: equal apart from letter case,
// or within a small edit distance (1 for short words, 2 from five letters
// on, 3 from nine), or else the one candidate that starts with s or that s
// starts with (from three letters on: time for time_limit). It returns ""
// when none is close or two tie.
func Closest(s string, candidates []string) string {
	for _, c := range candidates {
		if strings.EqualFold(s, c) {
			return c
		}
	}
	limit := 1
	if len(s) >= 5 {
		limit = 2
	}
	if len(s) >= 9 {
		limit = 3
	}
	best, bestD, tie := "", limit+1, false
	for _, c := range candidates {
		d := editDistance(s, c)
		switch {
		case d < bestD:
			best, bestD, tie = c, d, false
		case d == bestD:
			tie = true
		}
	}
	switch {
	case best != "" && !tie:
		return best
	case best != "" || len(s) < 3:
		return "" // two close candidates tie, or s is too short
	}
	var prefixed []string
	for _, c := range candidates {
		if strings.HasPrefix(c, s) || strings.HasPrefix(s, c) {
			prefixed = append(prefixed, c)
		}
	}
	if len(prefixed) == 1 {
		return prefixed[0]
	}
	return ""
}

// editDistance is the optimal-string-alignment distance between a and b:
// insertions, deletions, substitutions and swaps of neighbours each cost 1.
// It works on bytes; keys are ASCII.
func editDistance(a, b string) int {
	if len(a) > 64 || len(b) > 64 {
		return 1 << 20 // not worth comparing
	}
	prev2 := make([]int, len(b)+1)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(b)]
}
