//! Seeded pseudo-random numbers for the solver's unit tests (no external crate).

/// 64-bit LCG (Knuth's MMIX constants, from memory): enough for shuffles and random test
/// matrices.
pub struct Lcg(pub u64);

impl Lcg {
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        self.0 >> 11
    }

    /// Uniform in `0..m`.
    pub fn below(&mut self, m: usize) -> usize {
        (self.next_u64() % m as u64) as usize
    }

    /// Uniform in [−1, 1).
    pub fn symmetric(&mut self) -> f64 {
        (self.next_u64() as f64 / (1u64 << 53) as f64) * 2.0 - 1.0
    }

    /// Fisher–Yates shuffle of `0..n`.
    pub fn permutation(&mut self, n: usize) -> Vec<usize> {
        let mut p: Vec<usize> = (0..n).collect();
        for i in (1..n).rev() {
            let j: usize = self.below(i + 1);
            p.swap(i, j);
        }
        p
    }
}
