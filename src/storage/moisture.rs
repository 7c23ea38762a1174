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

    /// Number of radial cells.
    pub fn nr(&self) -> usize {
        self.r.len()
    }

    /// Advance by `dt` seconds with the given surfaces.
    pub fn step(&mut self, dt: f64, s: &Surfaces) {
        let nx = self.x.len();
        let nr = self.nr();
        let mut a = vec![0.0; nx.max(nr)];
        let mut b = vec![0.0; nx.max(nr)];
        let mut c = vec![0.0; nx.max(nr)];
        let mut d = vec![0.0; nx.max(nr)];
        let mut sc = vec![0.0; nx.max(nr)];
        // x direction, each radial cell
        let g = self.d_x * dt / (self.dx * self.dx);
        let end = |k: f64| -> f64 {
            // series: surface coefficient and half cell
            if k <= 0.0 {
                0.0
            } else {
                1.0 / (1.0 / k + 0.5 * self.dx / self.d_x.max(1e-30))
            }
        };
        let (kf, kb) = (end(s.front_m_s), end(s.back_m_s));
        {
            for ir in 0..nr {
                for ix in 0..nx {
                    let left = if ix > 0 { g } else { 0.0 };
                    let right = if ix + 1 < nx { g } else { 0.0 };
                    let mut diag = 1.0 + left + right;
                    let mut rhs = self.m[ix * nr + ir];
                    if ix == 0 {
                        let e = kf * dt / self.dx;
                        diag += e;
                        rhs += e * s.m_eq;
                    }
                    if ix + 1 == nx {
                        let e = kb * dt / self.dx;
                        diag += e;
                        rhs += e * s.m_eq;
                    }
                    a[ix] = -left;
                    b[ix] = diag;
                    c[ix] = -right;
                    d[ix] = rhs;
                }
                if thomas(&a[..nx], &b[..nx], &c[..nx], &mut d[..nx], &mut sc[..nx]) {
                    for (ix, v) in d[..nx].iter().enumerate() {
                        self.m[ix * nr + ir] = *v;
                    }
                }
            }
        }
        // r direction, each x cell: volume r_j w_j, face area f
        let f = &self.faces;
        let r = &self.r;
        let surf = |k: f64, half: f64| -> f64 {
            if k <= 0.0 {
                0.0
            } else {
                1.0 / (1.0 / k + half / self.d_r.max(1e-30))
            }
        };
        let kcore = surf(s.core_m_s, r[0] - f[0]);
        let kbar = surf(s.barrel_m_s, f[nr] - r[nr - 1]);
        for ix in 0..nx {
            for j in 0..nr {
                let vol = r[j] * (f[j + 1] - f[j]);
                let lo = if j > 0 {
                    self.d_r * f[j] / (r[j] - r[j - 1]) * dt / vol
                } else {
                    0.0
                };
                let hi = if j + 1 < nr {
                    self.d_r * f[j + 1] / (r[j + 1] - r[j]) * dt / vol
                } else {
                    0.0
                };
                let mut diag = 1.0 + lo + hi;
                let mut rhs = self.m[ix * nr + j];
                if j == 0 {
                    let e = kcore * f[0] * dt / vol;
                    diag += e;
                    rhs += e * s.m_eq;
                }
                if j + 1 == nr {
                    let e = kbar * f[nr] * dt / vol;
                    diag += e;
                    rhs += e * s.m_eq;
                }
                a[j] = -lo;
                b[j] = diag;
                c[j] = -hi;
                d[j] = rhs;
            }
            if thomas(&a[..nr], &b[..nr], &c[..nr], &mut d[..nr], &mut sc[..nr]) {
                self.m[ix * nr..(ix + 1) * nr].copy_from_slice(&d[..nr]);
            }
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
