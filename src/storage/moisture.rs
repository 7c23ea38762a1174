//! Moisture diffusion in the stored roll: along the width (in-plane, through the ends) and across
//! the layers (through the barrel and the core), with each surface's wrap as a resistance.
//!
//! Axisymmetric diffusion dM/dt = D_x d2M/dx2 + (D_r/r) d/dr(r dM/dr) (Crank, The Mathematics of
//! Diffusion, 2nd ed., 1975, ch. 5 for cylinders), finite volumes, Lie splitting with backward
//! Euler in each direction. A surface exchanges moisture with the air as
//! -D dM/dn = k (M - M_eq) (Crank's surface-evaporation condition, ch. 4) with k the wrap's
//! mass-transfer coefficient in series with the half cell. M is moisture content in percentage
//! points; M_eq comes from the GAB isotherm at the stretch's relative humidity.

use crate::numeric::thomas;

/// Surface mass-transfer coefficients (m/s) and the equilibrium moisture (%) for a step.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Surfaces {
    /// Front end face (x = 0).
    pub front_m_s: f64,
    /// Back end face (x = width).
    pub back_m_s: f64,
    /// Barrel (outer surface).
    pub barrel_m_s: f64,
    /// Core surface.
    pub core_m_s: f64,
    /// Equilibrium moisture of the air, %.
    pub m_eq: f64,
}

/// One implicit (backward-Euler) diffusion line:
/// (1 + l_j + r_j + e_j) m_j - l_j m_{j-1} - r_j m_{j+1} = m_j_old + e_j m_eq,
/// with exchange e only at the two end cells. The matrix is strictly diagonally dominant, so the
/// Thomas solve cannot meet a zero pivot.
struct Line {
    left: Vec<f64>,
    right: Vec<f64>,
    old: Vec<f64>,
    a: Vec<f64>,
    b: Vec<f64>,
    c: Vec<f64>,
    d: Vec<f64>,
    scratch: Vec<f64>,
}

impl Line {
    fn new(n: usize) -> Self {
        let z = || vec![0.0; n];
        Line {
            left: z(),
            right: z(),
            old: z(),
            a: z(),
            b: z(),
            c: z(),
            d: z(),
            scratch: z(),
        }
    }

    /// Solve the first `n` cells with end exchanges `e_first`, `e_last` towards `m_eq`.
    fn solve(&mut self, n: usize, e_first: f64, e_last: f64, m_eq: f64) -> &[f64] {
        for j in 0..n {
            let mut diag = 1.0 + self.left[j] + self.right[j];
            let mut rhs = self.old[j];
            for (end, e) in [(0, e_first), (n - 1, e_last)] {
                if j == end {
                    diag += e;
                    rhs += e * m_eq;
                }
            }
            self.a[j] = -self.left[j];
            self.b[j] = diag;
            self.c[j] = -self.right[j];
            self.d[j] = rhs;
        }
        let ok = thomas(
            &self.a[..n],
            &self.b[..n],
            &self.c[..n],
            &mut self.d[..n],
            &mut self.scratch[..n],
        );
        debug_assert!(ok, "diagonally dominant diffusion line cannot fail");
        &self.d[..n]
    }
}

/// The moisture field on an (x, r) grid of cells.
#[derive(Debug, Clone, PartialEq)]
pub struct Field {
    /// Cell centres across the width, m.
    pub x: Vec<f64>,
    /// Cell width across the width, m.
    pub dx: f64,
    /// Radial cell faces, m (len nr + 1).
    pub faces: Vec<f64>,
    /// Radial cell centres, m.
    pub r: Vec<f64>,
    /// Moisture, %, index ix * nr + ir.
    pub m: Vec<f64>,
    /// In-plane diffusivity, m2/s.
    pub d_x: f64,
    /// Radial diffusivity, m2/s.
    pub d_r: f64,
}

/// Radial cell faces from `r0` to `r1`, clustered towards both surfaces (Chebyshev spacing) so
/// the thin layers where moisture and the outer wraps' stresses change fastest are resolved.
pub fn radial_faces(r0: f64, r1: f64, cells: usize) -> Vec<f64> {
    (0..=cells)
        .map(|k| {
            let s = 0.5 * (1.0 - (std::f64::consts::PI * k as f64 / cells as f64).cos());
            r0 + (r1 - r0) * s
        })
        .collect()
}

/// Put `kg_m2` of water (per m2 of face) into `cells` of `m` in order, each up to `cap_pct`;
/// cell k takes `unit[k]` kg/m2 per point. What is left stays in the first cell.
fn fill(m: &mut [f64], cells: &[usize], unit: &[f64], kg_m2: f64, cap_pct: f64) {
    let mut left = kg_m2;
    for (&c, &u) in cells.iter().zip(unit) {
        if left <= 0.0 || u <= 0.0 {
            break;
        }
        let take = left.min((cap_pct - m[c]).max(0.0) * u);
        m[c] += take / u;
        left -= take;
    }
    if left > 0.0 {
        if let (Some(&c), Some(&u)) = (cells.first(), unit.first()) {
            m[c] += left / u;
        }
    }
}

impl Field {
    /// A uniform field of moisture `m0` (%).
    pub fn new(width: f64, nx: usize, faces: Vec<f64>, m0: f64, d_x: f64, d_r: f64) -> Self {
        let dx = width / nx as f64;
        let x = (0..nx).map(|i| (i as f64 + 0.5) * dx).collect();
        let r: Vec<f64> = faces.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
        let nr = r.len();
        Field {
            x,
            dx,
            faces,
            r,
            m: vec![m0; nx * nr],
            d_x,
            d_r,
        }
    }

    /// Set the moisture through the layers of every lateral cell to `at(x)` (%, x in m from the
    /// front edge) where it gives one: a moisture profile the web was wound with.
    pub fn set_across(&mut self, at: impl Fn(f64) -> Option<f64>) {
        let nr = self.nr();
        for (ix, &x) in self.x.iter().enumerate() {
            if let Some(m) = at(x) {
                self.m[ix * nr..(ix + 1) * nr].fill(m);
            }
        }
    }

    /// Put `water_kg_m2` (kg per m2 of face) into the paper under the barrel (`barrel`) and the
    /// two end faces (`ends`), as moisture of a stack of dry density `density_kg_m3`: 100 x water
    /// x face area / (density x volume) points (dry basis) in all. Paper takes up liquid water to
    /// about its moisture in saturated air, `cap_pct` (the isotherm at RH 1): each column of cells
    /// is filled from the face inwards up to that cap, so the wetted depth is water / (density x
    /// room) whatever the cells (putting all of it into the face cell made its moisture grow as
    /// the cell shrank: 67 % on a 64-cell grid). Water beyond the whole column's room (a face
    /// more than saturated through) stays in the face cell. Diffusion then carries it on.
    pub fn deposit(
        &mut self,
        water_kg_m2: f64,
        barrel: bool,
        ends: bool,
        density_kg_m3: f64,
        cap_pct: f64,
    ) {
        let (nx, nr) = (self.x.len(), self.nr());
        if nx == 0 || nr == 0 || !(water_kg_m2 > 0.0 && density_kg_m3 > 0.0) {
            return;
        }
        // kg of water per m2 of face that raises a cell by one point: density x the cell's
        // volume over the face's area / 100
        if barrel {
            // from the barrel in, the same for every column: r dr / R (per radian and dx)
            let big_r = self.faces[nr];
            let unit: Vec<f64> = (0..nr)
                .rev()
                .map(|j| {
                    density_kg_m3 * (self.r[j] * (self.faces[j + 1] - self.faces[j]) / big_r)
                        / 100.0
                })
                .collect();
            for ix in 0..nx {
                let cells: Vec<usize> = (0..nr).rev().map(|j| ix * nr + j).collect();
                fill(&mut self.m, &cells, &unit, water_kg_m2, cap_pct);
            }
        }
        if ends {
            // from each end face in: dx
            let unit = vec![density_kg_m3 * self.dx / 100.0; nx];
            for j in 0..nr {
                let front: Vec<usize> = (0..nx).map(|ix| ix * nr + j).collect();
                let back: Vec<usize> = (0..nx).rev().map(|ix| ix * nr + j).collect();
                fill(&mut self.m, &front, &unit, water_kg_m2, cap_pct);
                fill(&mut self.m, &back, &unit, water_kg_m2, cap_pct);
            }
        }
    }

    /// Number of radial cells.
    pub fn nr(&self) -> usize {
        self.r.len()
    }

    /// Advance by `dt` seconds with the given surfaces: an implicit sweep across the width for
    /// every radial cell, then an implicit sweep through the layers for every lateral cell.
    pub fn step(&mut self, dt: f64, s: &Surfaces) {
        let nx = self.x.len();
        let nr = self.nr();
        let mut line = Line::new(nx.max(nr));
        // series resistance of a surface coefficient k and the half cell next to it
        let series = |k: f64, half: f64, d: f64| -> f64 {
            if k <= 0.0 {
                0.0
            } else {
                1.0 / (1.0 / k + half / d.max(1e-30))
            }
        };
        // across the width: cells of equal width dx
        let g = self.d_x * dt / (self.dx * self.dx);
        let kf = series(s.front_m_s, 0.5 * self.dx, self.d_x) * dt / self.dx;
        let kb = series(s.back_m_s, 0.5 * self.dx, self.d_x) * dt / self.dx;
        for ix in 0..nx {
            line.left[ix] = if ix > 0 { g } else { 0.0 };
            line.right[ix] = if ix + 1 < nx { g } else { 0.0 };
        }
        for ir in 0..nr {
            for ix in 0..nx {
                line.old[ix] = self.m[ix * nr + ir];
            }
            let new = line.solve(nx, kf, kb, s.m_eq);
            for (ix, v) in new.iter().enumerate() {
                self.m[ix * nr + ir] = *v;
            }
        }
        // through the layers: cell volume r_j w_j, face area f
        let f = &self.faces;
        let r = &self.r;
        for j in 0..nr {
            let vol = r[j] * (f[j + 1] - f[j]);
            line.left[j] = if j > 0 {
                self.d_r * f[j] / (r[j] - r[j - 1]) * dt / vol
            } else {
                0.0
            };
            line.right[j] = if j + 1 < nr {
                self.d_r * f[j + 1] / (r[j + 1] - r[j]) * dt / vol
            } else {
                0.0
            };
        }
        let ecore = series(s.core_m_s, r[0] - f[0], self.d_r) * f[0] * dt / (r[0] * (f[1] - f[0]));
        let ebar = series(s.barrel_m_s, f[nr] - r[nr - 1], self.d_r) * f[nr] * dt
            / (r[nr - 1] * (f[nr] - f[nr - 1]));
        for ix in 0..nx {
            line.old[..nr].copy_from_slice(&self.m[ix * nr..(ix + 1) * nr]);
            let new = line.solve(nr, ecore, ebar, s.m_eq);
            self.m[ix * nr..(ix + 1) * nr].copy_from_slice(new);
        }
    }

    /// Volume-weighted mean moisture, %.
    pub fn mean(&self) -> f64 {
        let nr = self.nr();
        let mut s = 0.0;
        let mut w = 0.0;
        for ix in 0..self.x.len() {
            for j in 0..nr {
                let v = self.r[j] * (self.faces[j + 1] - self.faces[j]);
                s += v * self.m[ix * nr + j];
                w += v;
            }
        }
        s / w
    }

    /// Moisture at lateral position `x` (m) for radial cell `j`, linear between cell centres.
    pub fn at(&self, x: f64, j: usize) -> f64 {
        let nr = self.nr();
        let nx = self.x.len();
        let pos = ((x / self.dx) - 0.5).clamp(0.0, (nx - 1) as f64);
        let i0 = pos.floor() as usize;
        let i1 = (i0 + 1).min(nx - 1);
        let t = pos - i0 as f64;
        (1.0 - t) * self.m[i0 * nr + j] + t * self.m[i1 * nr + j]
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::erfc;

    /// Condensed water put into the faces is all there (conservation of mass): the field's water
    /// (moisture x dry density x cell volume) rises by the water per area times the wet faces'
    /// area, barrel f_nr W and two ends (f_nr^2 - f_0^2) / 2 each (per radian).
    #[test]
    fn condensed_water_is_conserved_in_the_field() {
        let faces = radial_faces(0.05, 0.5, 20);
        let (width, nx, rho) = (1.6, 40, 700.0);
        let water_of = |f: &Field| -> f64 {
            let nr = f.nr();
            (0..nx)
                .flat_map(|ix| (0..nr).map(move |j| (ix, j)))
                .map(|(ix, j)| {
                    f.m[ix * nr + j] / 100.0 * rho * f.r[j] * (f.faces[j + 1] - f.faces[j]) * f.dx
                })
                .sum()
        };
        let mut f = Field::new(width, nx, faces.clone(), 8.0, 1e-9, 1e-12);
        let before = water_of(&f);
        f.deposit(0.01, true, true, rho, 20.0);
        let (r0, r1) = (faces[0], faces[faces.len() - 1]);
        let want = 0.01 * (r1 * width + (r1 * r1 - r0 * r0));
        let got = water_of(&f) - before;
        assert!(
            (got - want).abs() < 1e-12 * want.max(1.0),
            "{got} vs {want}"
        );
        // the barrel cells gain, a cell inside does not
        assert!(f.m[(nx / 2) * f.nr() + f.nr() - 1] > 8.0);
        assert_eq!(f.m[(nx / 2) * f.nr() + 3], 8.0);
    }

    /// Condensed water wets the outer wraps to a depth set by mass balance alone, d = 100 w /
    /// (rho (cap - m0)) (the water per area over what a metre of stack takes up to the cap),
    /// whatever the radial cells: no cell goes past the cap, and the water's mean depth is d / 2
    /// to within the outer cell's thickness on 32 to 512 cells. (Before, all of it went into the
    /// outer cell, whose moisture grew as the cell shrank.)
    #[test]
    fn condensed_water_wets_a_depth_independent_of_the_cells() {
        let (rho, m0, cap, w) = (700.0, 8.0, 20.0, 0.05);
        let d = 100.0 * w / (rho * (cap - m0));
        for n in [32, 128, 512] {
            let faces = radial_faces(0.05, 0.5, n);
            let mut f = Field::new(1.0, 4, faces.clone(), m0, 1e-9, 1e-12);
            f.deposit(w, true, false, rho, cap);
            let nr = f.nr();
            let col = &f.m[nr..2 * nr];
            assert!(col.iter().all(|&m| m <= cap + 1e-12), "{n} cells");
            // water per cell (per radian and dx) and its mean depth under the barrel
            let big_r = faces[n];
            let (mut sum, mut moment) = (0.0, 0.0);
            for j in 0..nr {
                let wj = (col[j] - m0) * f.r[j] * (faces[j + 1] - faces[j]);
                sum += wj;
                moment += wj * (big_r - f.r[j]);
            }
            let outer = faces[n] - faces[n - 1];
            let mean = moment / sum;
            assert!(
                (mean - 0.5 * d).abs() <= outer,
                "{n} cells: mean depth {mean} vs {} (outer cell {outer})",
                0.5 * d
            );
        }
    }

    /// A moisture step across the width at winding (a wet band in a sealed roll) spreads as
    /// Crank's solution for two semi-infinite media: m = m2 + (m1 - m2) erfc(x / (2 sqrt(D t))) / 2
    /// about the step (Crank 1975, "The Mathematics of Diffusion", 2nd ed., section 2.2, eq. 2.14
    /// by memory of the number). Sealed faces (no exchange), the step at the middle of a roll far
    /// wider than the diffusion length sqrt(D t).
    #[test]
    fn a_moisture_step_at_winding_spreads_as_crank_s_erfc() {
        let (width, nx, d_x) = (0.2, 400, 1e-9);
        let faces = radial_faces(0.05, 0.06, 3);
        let mut f = Field::new(width, nx, faces, 8.0, d_x, 1e-13);
        f.set_across(|x| (x < 0.1).then_some(10.0));
        assert_eq!(f.m[0], 10.0);
        assert_eq!(f.m[(nx - 1) * f.nr()], 8.0);
        let sealed = Surfaces {
            front_m_s: 0.0,
            back_m_s: 0.0,
            barrel_m_s: 0.0,
            core_m_s: 0.0,
            m_eq: 5.0,
        };
        let (days, steps) = (30.0, 300);
        let t = days * crate::units::DAY_S;
        for _ in 0..steps {
            f.step(t / steps as f64, &sealed);
        }
        // diffusion length 2 sqrt(D t) = 3.2 mm against 0.5 mm cells
        let l = 2.0 * (d_x * t).sqrt();
        for ix in (nx / 2 - 12)..(nx / 2 + 12) {
            let x = f.x[ix] - 0.1;
            let want = 8.0 + 2.0 * 0.5 * erfc(x / l);
            let got = f.m[ix * f.nr()];
            assert!((got - want).abs() < 0.02, "x {x}: {got} vs {want}");
        }
    }
}
