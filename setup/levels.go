package setup

// FirstStop is the first stop among the cautions, or nil.
func FirstStop(cs []Caution) *Caution {
	for i := range cs {
		if cs[i].Level == Stop {
			return &cs[i]
		}
	}
	return nil
}
