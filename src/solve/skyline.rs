//! Skyline (profile) storage of a symmetric matrix and its LDLᵀ factorisation.
//!
//! Only the upper triangle is stored, column by column: column `j` holds rows
//! `first_row[j] ..= j` contiguously, ending with the diagonal. Everything above
//! `first_row[j]` is structurally zero, and the LDLᵀ factor fills in only inside this
//! envelope (A. George and J. W.-H. Liu, *Computer Solution of Large Sparse Positive Definite
//! Systems*, Prentice-Hall (1981), §4.1, envelope storage — from memory), so storage and work
//! grow with the profile rather than with n².
//!
//! The factorisation is the active-column (column-by-column) LDLᵀ reduction described in
//! K.-J. Bathe, *Finite Element Procedures*, Prentice-Hall (1996), §8.2 (from memory):
//! for column j, with m_ij = max(first_row\[i\], first_row\[j\]),
//!
//! ```text
//! g_ij = k_ij − Σ_{r = m_ij}^{i−1} l_ri · g_rj        i = first_row[j] .. j−1
//! l_ij = g_ij / d_i
//! d_j  = k_jj − Σ_{r = first_row[j]}^{j−1} l_rj · g_rj
//! ```
//!
//! Every inner sum is a dot product of two contiguous column slices.
//!
//! A stiffness matrix of a stable, adequately supported structure is symmetric positive
//! definite, so every pivot d_j is positive. [`SkylineMatrix::factor`] refuses a pivot that is
//! not clearly positive (see [`PIVOT_TOL`]): a zero or round-off-sized pivot means a mechanism
//! (a node direction that nothing restrains), a negative one means the matrix is indefinite,
//! as K + K_G becomes past the elastic critical load in a second-order analysis.

use nalgebra::DMatrix;

/// Relative pivot tolerance: a pivot `d_j ≤ PIVOT_TOL · |k_jj|` (k_jj the original diagonal
/// entry of that row) is taken as zero, i.e. the matrix is singular or indefinite.
///
/// Reasoning (common practice, no source): eliminating a direction that is restrained only
/// through round-off leaves a pivot of order n·ε·|k_jj| ≈ 1e-13·|k_jj| for a few thousand
/// equations, while genuine stiffness contrasts in building frames (axial against flexural
/// stiffness, stiff links) stay far below 1e12. A pivot of a stable but nearly unstable
/// structure (close to the elastic critical load) is small but still passes unless it is
/// within 1e-12 of the diagonal.
pub const PIVOT_TOL: f64 = 1e-12;

/// Failure of the LDLᵀ factorisation.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum FactorError {
    /// Pivot `index` (0-based equation number in the factor's ordering) is zero, round-off
    /// small or negative: the structure is a mechanism (missing support or too many releases)
    /// or, with geometric stiffness included, has lost stability.
    #[error(
        "stiffness matrix is not positive definite: pivot {pivot:e} at equation {index} \
         (a mechanism, a missing support or release, or loss of stability)"
    )]
    NotPositiveDefinite {
        /// 0-based equation where elimination broke down.
        index: usize,
        /// The offending pivot d_index.
        pivot: f64,
    },
}

/// Symmetric matrix in skyline (profile) storage.
#[derive(Debug, Clone, PartialEq)]
pub struct SkylineMatrix {
    /// `first_row[j]` ≤ j: first structurally nonzero row of column j.
    first_row: Vec<usize>,
    /// Offset of column j in `values`; `col_start[n]` = number of stored entries.
    col_start: Vec<usize>,
    /// Column j, rows `first_row[j] ..= j`, at `col_start[j] ..col_start[j + 1]`.
    values: Vec<f64>,
}

/// LDLᵀ factor of a [`SkylineMatrix`], in the same profile: column j holds the off-diagonal
/// entries l_rj of Lᵀ (unit diagonal implied) for r in `first_row[j] .. j`, and d_j in the
/// diagonal slot.
#[derive(Debug, Clone, PartialEq)]
pub struct SkylineFactor {
    first_row: Vec<usize>,
    col_start: Vec<usize>,
    values: Vec<f64>,
}

/// Column heights from groups of coupled equations: every group (the DOF numbers of one
/// element, say) couples all its members, so column j must reach up to the smallest index of
/// any group containing j. Returns `first_row` for [`SkylineMatrix::new`]. Indices ≥ `n` are
/// a programming error (checked by `debug_assert`, skipped otherwise).
pub fn first_rows<'a, I>(n: usize, groups: I) -> Vec<usize>
where
    I: IntoIterator<Item = &'a [usize]>,
{
    let mut first: Vec<usize> = (0..n).collect();
    for group in groups {
        let Some(&lowest) = group.iter().filter(|&&j| j < n).min() else {
            continue;
        };
        for &j in group {
            debug_assert!(j < n, "equation {j} out of range 0..{n}");
            if j < n {
                first[j] = first[j].min(lowest);
            }
        }
    }
    first
}

/// Offsets of each column for the given column heights (shared by matrix and factor).
fn column_starts(first_row: &[usize]) -> Vec<usize> {
    let mut starts: Vec<usize> = Vec::with_capacity(first_row.len() + 1);
    let mut total: usize = 0;
    starts.push(0);
    for (j, &f) in first_row.iter().enumerate() {
        total += j - f + 1;
        starts.push(total);
    }
    starts
}

impl SkylineMatrix {
    /// Zero matrix with column j stored from row `first_row[j]` to the diagonal.
    ///
    /// `first_row[j]` must be ≤ j (checked by `debug_assert`; a larger value is treated as j,
    /// i.e. a diagonal-only column).
    pub fn new(mut first_row: Vec<usize>) -> SkylineMatrix {
        for (j, f) in first_row.iter_mut().enumerate() {
            debug_assert!(*f <= j, "first_row[{j}] = {f} lies below the diagonal");
            *f = (*f).min(j);
        }
        let col_start: Vec<usize> = column_starts(&first_row);
        let values: Vec<f64> = vec![0.0; col_start[first_row.len()]];
        SkylineMatrix {
            first_row,
            col_start,
            values,
        }
    }

    /// Skyline copy of the upper triangle of a dense symmetric matrix, with each column's
    /// first row at its first nonzero entry. Meant for tests and small examples.
    pub fn from_dense(dense: &DMatrix<f64>) -> SkylineMatrix {
        let n: usize = dense.nrows().min(dense.ncols());
        let first_row: Vec<usize> = (0..n)
            .map(|j| (0..j).find(|&i| dense[(i, j)] != 0.0).unwrap_or(j))
            .collect();
        let mut matrix: SkylineMatrix = SkylineMatrix::new(first_row);
        for j in 0..n {
            for i in matrix.first_row[j]..=j {
                matrix.add(i, j, dense[(i, j)]);
            }
        }
        matrix
    }

    /// Number of equations.
    pub fn n(&self) -> usize {
        self.first_row.len()
    }

    /// Column heights: `first_rows()[j]` is the first stored row of column j.
    pub fn first_rows(&self) -> &[usize] {
        &self.first_row
    }

    /// Number of stored entries (upper triangle including the diagonal): the profile plus n.
    pub fn stored_len(&self) -> usize {
        self.values.len()
    }

    /// Position of entry (i, j) or (j, i) in `values`, `None` outside the profile.
    fn slot(&self, i: usize, j: usize) -> Option<usize> {
        let (row, col) = if i <= j { (i, j) } else { (j, i) };
        if col >= self.n() || row < self.first_row[col] {
            return None;
        }
        Some(self.col_start[col] + row - self.first_row[col])
    }

    /// Add `v` to entries (i, j) and (j, i) (one stored slot; either index order).
    ///
    /// Entries outside the profile or outside the matrix are ignored; adding a nonzero value
    /// there is a programming error caught by `debug_assert`.
    pub fn add(&mut self, i: usize, j: usize, v: f64) {
        match self.slot(i, j) {
            Some(k) => self.values[k] += v,
            None => debug_assert!(
                v == 0.0,
                "entry ({i}, {j}) = {v} lies outside the skyline profile"
            ),
        }
    }

    /// Entry (i, j); zero outside the profile.
    pub fn get(&self, i: usize, j: usize) -> f64 {
        self.slot(i, j).map_or(0.0, |k| self.values[k])
    }

    /// Diagonal entry (i, i).
    pub fn diagonal(&self, i: usize) -> f64 {
        self.values[self.col_start[i + 1] - 1]
    }

    /// Full symmetric product K·x (both triangles).
    ///
    /// # Panics
    /// If `x.len() != self.n()`.
    pub fn mul_vec(&self, x: &[f64]) -> Vec<f64> {
        assert_eq!(x.len(), self.n(), "mul_vec: vector length ≠ matrix order");
        let mut y: Vec<f64> = vec![0.0; self.n()];
        for (j, &xj) in x.iter().enumerate() {
            let first: usize = self.first_row[j];
            let column: &[f64] = &self.values[self.col_start[j]..self.col_start[j + 1]];
            let (upper, diag) = column.split_at(column.len() - 1);
            let mut yj: f64 = diag[0] * xj;
            for (r, &k_rj) in upper.iter().enumerate() {
                y[first + r] += k_rj * xj;
                yj += k_rj * x[first + r];
            }
            y[j] += yj;
        }
        y
    }

    /// Dense copy (both triangles). Meant for tests and small examples.
    pub fn to_dense(&self) -> DMatrix<f64> {
        DMatrix::from_fn(self.n(), self.n(), |i, j| self.get(i, j))
    }

    /// LDLᵀ factorisation with the default relative pivot tolerance [`PIVOT_TOL`].
    pub fn factor(&self) -> Result<SkylineFactor, FactorError> {
        self.factor_with_tol(PIVOT_TOL)
    }

    /// LDLᵀ factorisation (Bathe 1996, §8.2, active-column reduction, from memory) into a new
    /// [`SkylineFactor`]; `self` is left unchanged.
    ///
    /// Fails with [`FactorError::NotPositiveDefinite`] at the first equation j whose pivot
    /// satisfies `d_j ≤ tol · |k_jj|` (zero, round-off small, negative or not a number).
    pub fn factor_with_tol(&self, tol: f64) -> Result<SkylineFactor, FactorError> {
        self.eliminate(tol, false).map(|(factor, _)| factor)
    }

    /// LDLᵀ factorisation of a symmetric matrix that may be indefinite (no pivoting), and
    /// the number of negative pivots.
    ///
    /// By Sylvester's law of inertia the number of negative pivots of `K − σ·G = L·D·Lᵀ` is
    /// the number of negative eigenvalues of `K − σ·G`, which for a positive definite `K` is
    /// the number of eigenvalues of the pencil `K·φ = λ·G·φ` in `(0, σ)`: the Sturm
    /// sequence count (Bathe 1996, §8.2.5 and §11.4.3, from memory). Fails only at a pivot
    /// `|d_j| ≤ PIVOT_TOL·|k_jj|` (σ at or next to an eigenvalue, or a mechanism).
    pub fn factor_inertia(&self) -> Result<(SkylineFactor, usize), FactorError> {
        self.eliminate(PIVOT_TOL, true)
    }

    /// [`Self::factor`], in the matrix's own storage (no copy of it is made).
    pub fn into_factor(self) -> Result<SkylineFactor, FactorError> {
        self.into_eliminated(PIVOT_TOL, false)
            .map(|(factor, _)| factor)
    }

    /// [`Self::factor_inertia`], in the matrix's own storage.
    pub fn into_factor_inertia(self) -> Result<(SkylineFactor, usize), FactorError> {
        self.into_eliminated(PIVOT_TOL, true)
    }

    /// The active-column reduction of [`Self::factor_with_tol`]; with `indefinite` a
    /// negative pivot is kept (and counted) instead of refused.
    fn eliminate(&self, tol: f64, indefinite: bool) -> Result<(SkylineFactor, usize), FactorError> {
        self.clone().into_eliminated(tol, indefinite)
    }

    /// [`Self::eliminate`] in place.
    fn into_eliminated(
        self,
        tol: f64,
        indefinite: bool,
    ) -> Result<(SkylineFactor, usize), FactorError> {
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx") {
            // SAFETY: the processor has AVX (checked just above).
            return unsafe { self.eliminate_avx(tol, indefinite) };
        }
        self.eliminate_with::<false>(tol, indefinite)
    }

    /// [`Self::eliminate`] with AVX: the four partial sums of [`dot`] fill one 256-bit
    /// register, so every sum is added in the same order and the factor is the same to the
    /// last bit.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx")]
    fn eliminate_avx(
        self,
        tol: f64,
        indefinite: bool,
    ) -> Result<(SkylineFactor, usize), FactorError> {
        self.eliminate_with::<true>(tol, indefinite)
    }

    /// The active-column reduction of [`Self::eliminate`]; `AVX` only where the processor
    /// has it.
    #[inline(always)]
    fn eliminate_with<const AVX: bool>(
        self,
        tol: f64,
        indefinite: bool,
    ) -> Result<(SkylineFactor, usize), FactorError> {
        let mut negative: usize = 0;
        let n: usize = self.n();
        let SkylineMatrix {
            first_row,
            col_start,
            values: mut a,
        } = self;

        for j in 0..n {
            let fj: usize = first_row[j];
            let (done, rest) = a.split_at_mut(col_start[j]);
            let column: &mut [f64] = &mut rest[..col_start[j + 1] - col_start[j]];

            // g_ij = k_ij − Σ l_ri g_rj over the rows both columns share.
            for i in fj + 1..j {
                let fi: usize = first_row[i];
                let m: usize = fi.max(fj);
                if m < i {
                    let l_col_i: &[f64] = &done[col_start[i] + m - fi..col_start[i] + i - fi];
                    let g_col_j: &[f64] = &column[m - fj..i - fj];
                    column[i - fj] -= dot::<AVX>(l_col_i, g_col_j);
                }
            }

            // l_rj = g_rj / d_r and d_j = k_jj − Σ l_rj g_rj.
            let (upper, diag) = column.split_at_mut(j - fj);
            let k_jj: f64 = diag[0];
            let mut d_j: f64 = k_jj;
            for (offset, entry) in upper.iter_mut().enumerate() {
                let r: usize = fj + offset;
                let d_r: f64 = done[col_start[r + 1] - 1];
                let g: f64 = *entry;
                let l: f64 = g / d_r;
                *entry = l;
                d_j -= l * g;
            }
            // A NaN pivot (from NaN or infinite input) fails too.
            let refused = if indefinite {
                d_j.abs() <= tol * k_jj.abs()
            } else {
                d_j <= tol * k_jj.abs()
            };
            if d_j.is_nan() || refused {
                return Err(FactorError::NotPositiveDefinite {
                    index: j,
                    pivot: d_j,
                });
            }
            negative += usize::from(d_j < 0.0);
            diag[0] = d_j;
        }
        let factor = SkylineFactor {
            first_row,
            col_start,
            values: a,
        };
        Ok((factor, negative))
    }
}

/// Dot product of two slices of equal length, summed in four interleaved partial sums
/// (terms k, k+4, k+8, … in each) so that the processor can overlap the additions: the
/// factorization and the forward substitution spend most of their time here (issue 21).
/// The order of the additions differs from a running sum only by round-off.
///
/// With `AVX` (only where the processor has it) the four partial sums are the four lanes of
/// one 256-bit register: the same additions in the same order.
#[inline(always)]
fn dot<const AVX: bool>(a: &[f64], b: &[f64]) -> f64 {
    #[cfg(target_arch = "x86_64")]
    if AVX {
        // SAFETY: `AVX` is set only where the processor has AVX.
        return unsafe { dot_avx(a, b) };
    }
    let n = a.len().min(b.len());
    let (a4, b4) = (a[..n].chunks_exact(4), b[..n].chunks_exact(4));
    let (ra, rb) = (a4.remainder(), b4.remainder());
    let mut s = [0.0f64; 4];
    for (x, y) in a4.zip(b4) {
        s[0] += x[0] * y[0];
        s[1] += x[1] * y[1];
        s[2] += x[2] * y[2];
        s[3] += x[3] * y[3];
    }
    let tail: f64 = ra.iter().zip(rb).map(|(x, y)| x * y).sum();
    (s[0] + s[1]) + (s[2] + s[3]) + tail
}

/// [`dot`] on AVX registers: lane k sums the terms k, k+4, k+8, … as `s[k]` does.
///
/// # Safety
/// The processor must have AVX.
#[cfg(target_arch = "x86_64")]
#[inline(always)]
unsafe fn dot_avx(a: &[f64], b: &[f64]) -> f64 {
    use std::arch::x86_64::{
        _mm256_add_pd, _mm256_loadu_pd, _mm256_mul_pd, _mm256_setzero_pd, _mm256_storeu_pd,
    };
    let n = a.len().min(b.len());
    let whole = n - n % 4;
    let mut s = [0.0f64; 4];
    // SAFETY: every load reads four values at k < whole ≤ n of both slices.
    unsafe {
        let mut acc = _mm256_setzero_pd();
        let mut k = 0;
        while k < whole {
            let x = _mm256_loadu_pd(a.as_ptr().add(k));
            let y = _mm256_loadu_pd(b.as_ptr().add(k));
            acc = _mm256_add_pd(acc, _mm256_mul_pd(x, y));
            k += 4;
        }
        _mm256_storeu_pd(s.as_mut_ptr(), acc);
    }
    let tail: f64 = a[whole..n]
        .iter()
        .zip(&b[whole..n])
        .map(|(x, y)| x * y)
        .sum();
    (s[0] + s[1]) + (s[2] + s[3]) + tail
}

impl SkylineFactor {
    /// Number of equations.
    pub fn n(&self) -> usize {
        self.first_row.len()
    }

    /// Pivot d_i of K = L·D·Lᵀ (all positive for a successful factorisation).
    pub fn pivot(&self, i: usize) -> f64 {
        self.values[self.col_start[i + 1] - 1]
    }

    /// Solve K·x = b in place: `b` holds the right-hand side on entry and x on return.
    /// Forward substitution L·y = b, scaling z = D⁻¹·y, back substitution Lᵀ·x = z
    /// (Bathe 1996, §8.2, from memory).
    ///
    /// # Panics
    /// If `b.len() != self.n()`.
    pub fn solve(&self, b: &mut [f64]) {
        assert_eq!(b.len(), self.n(), "solve: vector length ≠ matrix order");
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx") {
            // SAFETY: the processor has AVX (checked just above).
            return unsafe { self.solve_avx(b) };
        }
        self.solve_with::<false>(b)
    }

    /// [`Self::solve`] with AVX (the same sums in the same order, see [`dot`]).
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx")]
    fn solve_avx(&self, b: &mut [f64]) {
        self.solve_with::<true>(b)
    }

    /// The substitutions of [`Self::solve`].
    #[inline(always)]
    fn solve_with<const AVX: bool>(&self, b: &mut [f64]) {
        let n: usize = self.n();
        // L·y = b: y_j = b_j − Σ l_rj y_r.
        for j in 0..n {
            let fj: usize = self.first_row[j];
            let l_col: &[f64] = &self.values[self.col_start[j]..self.col_start[j + 1] - 1];
            b[j] -= dot::<AVX>(l_col, &b[fj..j]);
        }
        // z = D⁻¹·y.
        for (j, bj) in b.iter_mut().enumerate() {
            *bj /= self.pivot(j);
        }
        // Lᵀ·x = z, column-oriented: once x_j is known, remove it from the rows above.
        for j in (0..n).rev() {
            let fj: usize = self.first_row[j];
            let l_col: &[f64] = &self.values[self.col_start[j]..self.col_start[j + 1] - 1];
            let x_j: f64 = b[j];
            for (b_r, &l_rj) in b[fj..j].iter_mut().zip(l_col) {
                *b_r -= l_rj * x_j;
            }
        }
    }

    /// Solve for several right-hand sides, each in place (one [`SkylineFactor::solve`] each).
    ///
    /// # Panics
    /// If any vector's length differs from `self.n()`.
    pub fn solve_many(&self, rhs: &mut [Vec<f64>]) {
        for b in rhs.iter_mut() {
            self.solve(b);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::solve::test_rng::Lcg;

    /// Allowance c in the residual test ‖K·x − b‖∞ ≤ c·ε·n·‖K‖∞·‖x‖∞. A backward-stable
    /// Cholesky/LDLᵀ solve satisfies (K + ΔK)·x = b with |ΔK| ≤ γ_{3n+1}·|Lᵀ|·|D|·|L|
    /// (N. J. Higham, *Accuracy and Stability of Numerical Algorithms*, 2nd ed. (2002),
    /// Thm 10.4 — from memory); for the well-scaled SPD test matrices here |L||D||Lᵀ| is
    /// comparable to |K|, and c = 10 leaves room for the constant 3 plus norm conversions
    /// (common practice, no source).
    const RESIDUAL_ALLOWANCE: f64 = 10.0;

    fn norm_inf(v: &[f64]) -> f64 {
        v.iter().fold(0.0, |m, x| m.max(x.abs()))
    }

    fn matrix_norm_inf(k: &SkylineMatrix) -> f64 {
        let ones_abs: Vec<f64> = (0..k.n())
            .map(|i| (0..k.n()).map(|j| k.get(i, j).abs()).sum())
            .collect();
        norm_inf(&ones_abs)
    }

    /// Random column heights: each column reaches up at most `max_height` rows.
    fn random_profile(rng: &mut Lcg, n: usize, max_height: usize) -> Vec<usize> {
        (0..n)
            .map(|j| j - rng.below(j.min(max_height) + 1))
            .collect()
    }

    /// Strictly diagonally dominant symmetric matrix, random entries filling the profile.
    /// SPD by Gershgorin's theorem (any linear-algebra text; closed form).
    fn dominant(rng: &mut Lcg, n: usize, max_height: usize) -> SkylineMatrix {
        let mut k: SkylineMatrix = SkylineMatrix::new(random_profile(rng, n, max_height));
        let mut row_sum: Vec<f64> = vec![0.0; n];
        for j in 0..n {
            for i in k.first_rows()[j]..j {
                let v: f64 = rng.symmetric();
                k.add(i, j, v);
                row_sum[i] += v.abs();
                row_sum[j] += v.abs();
            }
        }
        for (i, s) in row_sum.iter().enumerate() {
            k.add(i, i, s + 1.0 + rng.symmetric().abs());
        }
        k
    }

    /// K = L·Lᵀ with L lower triangular inside the envelope (entries in row j from column
    /// first_row[j]) and diagonal in [1, 2]; K then lies in the same envelope (George & Liu
    /// 1981, §4.1, from memory: an envelope is closed under Cholesky factors), and is SPD.
    fn gram(rng: &mut Lcg, n: usize, max_height: usize) -> SkylineMatrix {
        let first: Vec<usize> = random_profile(rng, n, max_height);
        let mut l: DMatrix<f64> = DMatrix::zeros(n, n);
        for j in 0..n {
            let scale: f64 = 1.0 / ((j - first[j]) as f64 + 1.0).sqrt();
            for c in first[j]..j {
                l[(j, c)] = rng.symmetric() * scale;
            }
            l[(j, j)] = 1.0 + rng.symmetric().abs();
        }
        let dense: DMatrix<f64> = &l * l.transpose();
        let mut k: SkylineMatrix = SkylineMatrix::new(first.clone());
        for j in 0..n {
            for i in first[j]..=j {
                k.add(i, j, dense[(i, j)]);
            }
        }
        k
    }

    /// Solve K·x = b for a random b and check the backward residual.
    fn assert_solves(k: &SkylineMatrix, rng: &mut Lcg) {
        let n: usize = k.n();
        let b: Vec<f64> = (0..n).map(|_| rng.symmetric()).collect();
        let factor: SkylineFactor = k.factor().expect("SPD test matrix");
        let mut x: Vec<f64> = b.clone();
        factor.solve(&mut x);
        let kx: Vec<f64> = k.mul_vec(&x);
        let residual: Vec<f64> = kx.iter().zip(&b).map(|(a, c)| a - c).collect();
        let bound: f64 =
            RESIDUAL_ALLOWANCE * f64::EPSILON * n as f64 * matrix_norm_inf(k) * norm_inf(&x);
        assert!(
            norm_inf(&residual) <= bound,
            "n = {n}: residual {} > {bound}",
            norm_inf(&residual)
        );
    }

    #[test]
    fn solves_random_dominant_band_matrices() {
        let mut rng: Lcg = Lcg(2024);
        for &(n, h) in &[
            (1usize, 0usize),
            (2, 1),
            (7, 3),
            (40, 6),
            (200, 15),
            (600, 40),
        ] {
            let k: SkylineMatrix = dominant(&mut rng, n, h);
            assert_solves(&k, &mut rng);
        }
    }

    #[test]
    fn solves_random_gram_matrices_in_a_profile() {
        let mut rng: Lcg = Lcg(99);
        for &(n, h) in &[(1usize, 0usize), (3, 2), (12, 5), (60, 10), (150, 30)] {
            let k: SkylineMatrix = gram(&mut rng, n, h);
            assert_solves(&k, &mut rng);
        }
    }

    /// Same solution as nalgebra's dense Cholesky (an independent implementation).
    #[test]
    fn agrees_with_dense_cholesky() {
        let mut rng: Lcg = Lcg(5);
        for trial in 0..20 {
            let n: usize = 1 + trial % 12;
            let k: SkylineMatrix = if trial % 2 == 0 {
                dominant(&mut rng, n, 4)
            } else {
                gram(&mut rng, n, 6)
            };
            let b: Vec<f64> = (0..n).map(|_| rng.symmetric()).collect();
            let mut x: Vec<f64> = b.clone();
            k.factor().expect("SPD").solve(&mut x);
            let reference = k
                .to_dense()
                .cholesky()
                .expect("SPD")
                .solve(&nalgebra::DVector::from_vec(b));
            let diff: f64 = x
                .iter()
                .zip(reference.iter())
                .fold(0.0, |m, (a, c)| m.max((a - c).abs()));
            assert!(
                diff <= 1e-10 * reference.amax().max(1.0),
                "trial {trial}: {diff}"
            );
        }
    }

    /// Closed form: [[4, 2], [2, 3]]·x = [2, 1] gives det = 8, x = [(2·3 − 2·1)/8,
    /// (4·1 − 2·2)/8] = [0.5, 0]; LDLᵀ pivots d0 = 4, d1 = 3 − 2²/4 = 2.
    /// The interleaved dot product against the running sum (the reference path of issue
    /// 21) on every length up to 13, so that every remainder of 4 is met: equal to
    /// round-off, and exact on integers.
    #[test]
    fn interleaved_dot_matches_the_running_sum() {
        for n in 0..14 {
            let a: Vec<f64> = (0..n).map(|k| 1.0 + 0.37 * k as f64).collect();
            let b: Vec<f64> = (0..n).map(|k| (k as f64 - 4.5) / 3.0).collect();
            let running: f64 = a.iter().zip(&b).map(|(x, y)| x * y).sum();
            let scale: f64 = a.iter().zip(&b).map(|(x, y)| (x * y).abs()).sum();
            assert!(
                (dot::<false>(&a, &b) - running).abs() <= 1e-15 * scale.max(1.0),
                "n = {n}"
            );
            let ints: Vec<f64> = (0..n).map(|k| k as f64).collect();
            // closed form: Σ k² for k < n is (n − 1)·n·(2n − 1)/6.
            let sq = ((n as f64 - 1.0) * n as f64 * (2.0 * n as f64 - 1.0) / 6.0).max(0.0);
            assert_eq!(dot::<false>(&ints, &ints), sq);
            // The AVX lanes are the four partial sums: the same value to the last bit.
            #[cfg(target_arch = "x86_64")]
            if std::arch::is_x86_feature_detected!("avx") {
                let lanes = unsafe { dot_avx(&a, &b) };
                assert_eq!(lanes.to_bits(), dot::<false>(&a, &b).to_bits(), "n = {n}");
            }
        }
    }

    #[test]
    fn two_by_two_closed_form() {
        let mut k: SkylineMatrix = SkylineMatrix::new(vec![0, 0]);
        k.add(0, 0, 4.0);
        k.add(1, 0, 2.0);
        k.add(1, 1, 3.0);
        let f: SkylineFactor = k.factor().unwrap();
        assert_eq!(f.pivot(0), 4.0);
        assert_eq!(f.pivot(1), 2.0);
        let mut x: Vec<f64> = vec![2.0, 1.0];
        f.solve(&mut x);
        assert_eq!(x, vec![0.5, 0.0]);
        // The matrix itself is kept.
        assert_eq!(k.get(0, 1), 2.0);
        assert_eq!(k.diagonal(1), 3.0);
    }

    #[test]
    fn add_is_symmetric_and_get_is_zero_outside_profile() {
        let mut k: SkylineMatrix = SkylineMatrix::new(vec![0, 0, 1, 3]);
        k.add(0, 1, 1.5);
        k.add(1, 0, 0.5);
        k.add(3, 3, 2.0);
        k.add(0, 3, 0.0); // outside the profile, zero: silently ignored
        assert_eq!(k.get(1, 0), 2.0);
        assert_eq!(k.get(0, 1), 2.0);
        assert_eq!(k.get(0, 2), 0.0);
        assert_eq!(k.get(2, 3), 0.0);
        assert_eq!(k.diagonal(3), 2.0);
        assert_eq!(k.n(), 4);
        assert_eq!(k.stored_len(), 1 + 2 + 2 + 1);
    }

    #[cfg(debug_assertions)]
    #[test]
    #[should_panic(expected = "outside the skyline profile")]
    fn nonzero_outside_profile_is_caught_in_debug() {
        let mut k: SkylineMatrix = SkylineMatrix::new(vec![0, 1]);
        k.add(0, 1, 1.0);
    }

    #[test]
    fn mul_vec_matches_dense_product() {
        let mut rng: Lcg = Lcg(17);
        let k: SkylineMatrix = dominant(&mut rng, 25, 5);
        let x: Vec<f64> = (0..25).map(|_| rng.symmetric()).collect();
        let dense = k.to_dense() * nalgebra::DVector::from_vec(x.clone());
        let y: Vec<f64> = k.mul_vec(&x);
        for (a, b) in y.iter().zip(dense.iter()) {
            assert!((a - b).abs() <= 1e-12 * b.abs().max(1.0));
        }
        assert_eq!(
            SkylineMatrix::from_dense(&k.to_dense()).to_dense(),
            k.to_dense()
        );
    }

    #[test]
    fn empty_matrix_factors_and_solves() {
        let k: SkylineMatrix = SkylineMatrix::new(Vec::new());
        let f: SkylineFactor = k.factor().unwrap();
        let mut b: Vec<f64> = Vec::new();
        f.solve(&mut b);
        assert!(k.mul_vec(&[]).is_empty());
    }

    /// A zero row and column (a DOF nothing connects to) at equation 3 gives pivot 0 there.
    #[test]
    fn zero_row_is_reported_at_its_index() {
        let mut rng: Lcg = Lcg(8);
        let source: DMatrix<f64> = dominant(&mut rng, 6, 5).to_dense();
        let mut dense: DMatrix<f64> = source.clone();
        dense.row_mut(3).fill(0.0);
        dense.column_mut(3).fill(0.0);
        let err: FactorError = SkylineMatrix::from_dense(&dense).factor().unwrap_err();
        assert_eq!(
            err,
            FactorError::NotPositiveDefinite {
                index: 3,
                pivot: 0.0
            }
        );
    }

    /// Rank-deficient 2×2 block [[a, b], [b, b²/a]] (closed form: det = 0) in rows 2, 3: the
    /// second pivot d3 = b²/a − b²/a is zero up to round-off, below PIVOT_TOL·k33.
    #[test]
    fn rank_deficient_block_is_reported() {
        let (a, b) = (3.0_f64, 1.1_f64);
        let mut k: SkylineMatrix = SkylineMatrix::new(vec![0, 1, 2, 2, 4]);
        k.add(0, 0, 1.0);
        k.add(1, 1, 2.0);
        k.add(2, 2, a);
        k.add(2, 3, b);
        k.add(3, 3, b * b / a);
        k.add(4, 4, 1.0);
        match k.factor() {
            Err(FactorError::NotPositiveDefinite { index, pivot }) => {
                assert_eq!(index, 3);
                assert!(pivot.abs() <= 1e-15);
            }
            other => panic!("expected a singular pivot, got {other:?}"),
        }
    }

    /// Mechanism: an axial bar chain of 8 elements with stiffness EA/L and no support. Its
    /// stiffness matrix (closed form: tridiagonal, k on the end diagonals, 2k inside, −k off
    /// the diagonal) has the rigid translation [1, …, 1] in its null space, so the last pivot
    /// is zero up to round-off.
    #[test]
    fn unsupported_bar_chain_is_a_mechanism() {
        let k_bar: f64 = 200e9 * 0.0123 / 3.7; // EA/L, N/m (invented section)
        let n: usize = 9;
        let elements: Vec<[usize; 2]> = (0..n - 1).map(|e| [e, e + 1]).collect();
        let mut k: SkylineMatrix =
            SkylineMatrix::new(first_rows(n, elements.iter().map(|p| &p[..])));
        for e in 0..n - 1 {
            k.add(e, e, k_bar);
            k.add(e + 1, e + 1, k_bar);
            k.add(e, e + 1, -k_bar);
        }
        match k.factor() {
            Err(FactorError::NotPositiveDefinite { index, .. }) => assert_eq!(index, n - 1),
            other => panic!("expected a mechanism, got {other:?}"),
        }
        // One support (a spring of the same stiffness at node 0) makes it stable.
        k.add(0, 0, k_bar);
        assert!(k.factor().is_ok());
    }

    /// Closed form: [[1, 2], [2, 1]] has eigenvalues 3 and −1; LDLᵀ gives d0 = 1,
    /// d1 = 1 − 2²/1 = −3.
    #[test]
    fn indefinite_matrix_is_reported_with_its_negative_pivot() {
        let k: SkylineMatrix =
            SkylineMatrix::from_dense(&DMatrix::from_row_slice(2, 2, &[1.0, 2.0, 2.0, 1.0]));
        assert_eq!(
            k.factor().unwrap_err(),
            FactorError::NotPositiveDefinite {
                index: 1,
                pivot: -3.0
            }
        );
        let negative: SkylineMatrix =
            SkylineMatrix::from_dense(&DMatrix::from_row_slice(1, 1, &[-2.0]));
        assert_eq!(
            negative.factor().unwrap_err(),
            FactorError::NotPositiveDefinite {
                index: 0,
                pivot: -2.0
            }
        );
    }

    /// The second-difference matrix tridiag(−1, 2, −1) of order `n`, shifted by −λ on its
    /// diagonal.
    fn second_difference(n: usize, lambda: f64) -> SkylineMatrix {
        let mut k = SkylineMatrix::new((0..n).map(|j| j.saturating_sub(1)).collect());
        for i in 0..n {
            k.add(i, i, 2.0 - lambda);
            if i + 1 < n {
                k.add(i, i + 1, -1.0);
            }
        }
        k
    }

    /// Loss of stability in the pattern of K − λ·K_G: the second-difference matrix
    /// tridiag(−1, 2, −1) of order n has eigenvalues 2 − 2·cos(kπ/(n+1)) (closed form:
    /// eigenvectors sin(i·kπ/(n+1)) satisfy the difference equation), so for n = 5 the
    /// smallest is 2 − 2·cos(π/6) = 0.2679…. Shifting by λ = 0.26 must still factor, by
    /// λ = 0.28 must fail with a negative pivot.
    #[test]
    fn shift_past_smallest_eigenvalue_is_detected() {
        let shifted = |lambda: f64| second_difference(5, lambda).factor();
        let lambda_min: f64 = 2.0 - 2.0 * (std::f64::consts::PI / 6.0).cos();
        assert!(lambda_min > 0.26 && lambda_min < 0.28);
        assert!(shifted(0.26).is_ok());
        match shifted(0.28) {
            Err(FactorError::NotPositiveDefinite { pivot, .. }) => assert!(pivot < 0.0),
            other => panic!("expected an indefinite matrix, got {other:?}"),
        }
    }

    /// Sturm count on the same second-difference matrix: the eigenvalues of
    /// tridiag(−1, 2, −1), n = 5, are 2 − 2·cos(kπ/6), k = 1…5 (closed form, see above):
    /// 0.268, 1, 2, 3, 3.732. The negative pivots of the matrix shifted by λ count the
    /// eigenvalues below λ (Sylvester's law of inertia), and the indefinite factor still
    /// solves: K·x = b is checked by multiplying back.
    #[test]
    fn negative_pivots_count_the_eigenvalues_below_the_shift() {
        let n: usize = 5;
        let shifted = |lambda: f64| second_difference(n, lambda);
        for (lambda, below) in [(0.1, 0), (0.5, 1), (1.5, 2), (2.5, 3), (3.5, 4), (3.9, 5)] {
            let k = shifted(lambda);
            let (factor, negative) = k.factor_inertia().expect("not singular");
            assert_eq!(negative, below, "shift {lambda}");
            let b: Vec<f64> = (0..n).map(|i| 1.0 + i as f64).collect();
            let mut x = b.clone();
            factor.solve(&mut x);
            for (got, want) in k.mul_vec(&x).iter().zip(&b) {
                assert!((got - want).abs() <= 1e-12 * 5.0, "{got} vs {want}");
            }
        }
        // At an eigenvalue (λ = 2: the middle pivot vanishes) the count is refused.
        assert!(shifted(2.0).factor_inertia().is_err());
    }

    /// Non-finite input must not pass as a valid factor.
    #[test]
    fn non_finite_entries_are_rejected() {
        for bad in [f64::NAN, f64::INFINITY] {
            let mut k: SkylineMatrix = SkylineMatrix::new(vec![0, 0]);
            k.add(0, 0, 1.0);
            k.add(0, 1, bad);
            k.add(1, 1, 1.0);
            assert!(k.factor().is_err(), "{bad} accepted");
        }
    }

    #[test]
    fn first_rows_from_element_groups() {
        let groups: Vec<Vec<usize>> = vec![vec![0, 1, 2, 3, 4, 5], vec![3, 4, 5, 9, 10, 11]];
        let first: Vec<usize> = first_rows(12, groups.iter().map(|g| &g[..]));
        assert_eq!(first, vec![0, 0, 0, 0, 0, 0, 6, 7, 8, 3, 3, 3]);
    }

    #[test]
    fn solve_many_matches_single_solves() {
        let mut rng: Lcg = Lcg(31);
        let k: SkylineMatrix = dominant(&mut rng, 30, 6);
        let f: SkylineFactor = k.factor().unwrap();
        let b1: Vec<f64> = (0..30).map(|_| rng.symmetric()).collect();
        let b2: Vec<f64> = (0..30).map(|_| rng.symmetric()).collect();
        let mut many: Vec<Vec<f64>> = vec![b1.clone(), b2.clone()];
        f.solve_many(&mut many);
        let mut x1: Vec<f64> = b1;
        f.solve(&mut x1);
        assert_eq!(many[0], x1);
        assert_ne!(many[1], b2);
    }
}
