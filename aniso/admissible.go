package aniso

// rotationMode returns ΩF for Ω = [[0, −1], [1, 0]], the increment of F
// under an infinitesimal in-plane rigid rotation, in the order
// (F11, F12, F21, F22).
func rotationMode(F [4]float64) [4]float64 {
	return [4]float64{-F[2], -F[3], F[0], F[1]}
}

// quadForm returns xᵀ A y.
func quadForm(A *[4][4]float64, x, y [4]float64) float64 {
	s := 0.0
	for i := range x {
		for j := range y {
			s += x[i] * A[i][j] * y[j]
		}
	}
	return s
}
