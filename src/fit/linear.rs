//! Exact rational linear systems: Gauss-Jordan elimination to reduced row
//! echelon form, and from it a particular solution, the null space, and
//! which unknowns vanish in every solution.

use rug::Rational;

use super::Solution;

/// A consistent system in reduced row echelon form.
pub struct Reduced {
    /// Rows with a leading 1 in column pivots[i]; the last entry is the right-hand side.
    rows: Vec<Vec<Rational>>,
    pub pivots: Vec<usize>,
    unknowns: usize,
}

/// Gauss-Jordan elimination; None when the system is inconsistent.
pub fn reduce(mut rows: Vec<Vec<Rational>>, unknowns: usize) -> Option<Reduced> {
    let mut pivots = Vec::new();
    let mut r = 0;
    for col in 0..unknowns {
        let Some(p) = (r..rows.len()).find(|&i| rows[i][col] != 0) else {
            continue;
        };
        rows.swap(r, p);
        let inv = Rational::from(rows[r][col].recip_ref());
        for x in rows[r].iter_mut() {
            *x *= &inv;
        }
        let pivot_row = rows[r].clone();
        for (i, row) in rows.iter_mut().enumerate() {
            if i != r && row[col] != 0 {
                let f = row[col].clone();
                for (x, y) in row.iter_mut().zip(&pivot_row) {
                    *x -= Rational::from(&f * y);
                }
            }
        }
        pivots.push(col);
        r += 1;
    }
    if rows[r..].iter().any(|row| row[unknowns] != 0) {
        return None;
    }
    rows.truncate(r);
    Some(Reduced {
        rows,
        pivots,
        unknowns,
    })
}

impl Reduced {
    pub fn particular(&self) -> Vec<Rational> {
        let mut a = vec![Rational::new(); self.unknowns];
        for (row, &p) in self.rows.iter().zip(&self.pivots) {
            a[p] = row[self.unknowns].clone();
        }
        a
    }

    pub fn null_space(&self) -> Vec<Vec<Rational>> {
        (0..self.unknowns)
            .filter(|c| !self.pivots.contains(c))
            .map(|free| {
                let mut v = vec![Rational::new(); self.unknowns];
                v[free] = Rational::from(1);
                for (row, &p) in self.rows.iter().zip(&self.pivots) {
                    v[p] = Rational::from(-&row[free]);
                }
                v
            })
            .collect()
    }

    pub fn solution(&self) -> Solution {
        let null_space = self.null_space();
        if null_space.is_empty() {
            Solution::Unique(self.particular())
        } else {
            Solution::Family {
                particular: self.particular(),
                null_space,
            }
        }
    }

    /// Whether each a_k is zero in every solution.
    pub fn forced_zero(&self) -> Vec<bool> {
        let p = self.particular();
        let null = self.null_space();
        (0..self.unknowns)
            .map(|k| p[k] == 0 && null.iter().all(|v| v[k] == 0))
            .collect()
    }
}
