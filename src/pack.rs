//! Numbers the storage kernel runs on: one `f64`, or a [`Pack`] of several independent runs side
//! by side (the same operations on each member, in the same order, so each member's result has
//! the bits a run of its own gives; the compiler turns the member loops into vector
//! instructions, and the members' chains of dependent divisions run interleaved).

use std::ops::{Add, AddAssign, Div, Mul, Neg, Sub};

/// Environment variable that keeps every kernel on its generic build when set, to any value
/// (even empty or 0): for checking that the AVX2 builds give the same bits
/// (`tests/vector_width.rs`).
pub const GENERIC_ENV: &str = "ROLLSLEUTH_GENERIC";

/// Whether the kernels built for AVX2 may run: the processor has AVX2 and [`GENERIC_ENV`] is
/// not set (read once). Those builds give the generic build's bits: IEEE division, root,
/// product and sum are correctly rounded whatever the vector width, Rust fuses no multiply-add,
/// and the library functions they call (`exp`, `ln_1p`, `exp_m1`) are the same calls in both.
#[inline]
pub fn avx2() -> bool {
    static WIDE: std::sync::OnceLock<bool> = std::sync::OnceLock::new();
    *WIDE.get_or_init(|| {
        #[cfg(target_arch = "x86_64")]
        let has = std::arch::is_x86_feature_detected!("avx2");
        #[cfg(not(target_arch = "x86_64"))]
        let has = false;
        has && std::env::var_os(GENERIC_ENV).is_none()
    })
}

/// Watches values for a member that is not finite, without a test per value: x - x is 0 for a
/// finite x and NaN otherwise, and a sum of zeros stays 0 while one NaN makes it NaN.
#[derive(Debug, Clone, Copy)]
pub struct Finite<T>(T);

impl<T: Real> Finite<T> {
    #[inline(always)]
    pub fn new() -> Self {
        Finite(T::splat(0.0))
    }
    /// Watch `x`.
    #[inline(always)]
    #[allow(clippy::eq_op)] // x - x is the test itself
    pub fn see(&mut self, x: T) {
        self.0 += x - x;
    }
    /// The members of which some value watched was not finite, as bits.
    #[inline(always)]
    pub fn failed(self) -> u32 {
        self.0.which(|v| v != 0.0)
    }
}

impl<T: Real> Default for Finite<T> {
    fn default() -> Self {
        Self::new()
    }
}

/// A number of the storage kernel: `f64`, or a [`Pack`] of members.
pub trait Real:
    Copy
    + Default
    + Add<Output = Self>
    + Sub<Output = Self>
    + Mul<Output = Self>
    + Div<Output = Self>
    + Neg<Output = Self>
    + AddAssign
    + Add<f64, Output = Self>
    + Sub<f64, Output = Self>
    + Mul<f64, Output = Self>
    + Div<f64, Output = Self>
{
    /// The members, as bits (member m is bit m): 1 for `f64`.
    const ALL: u32;
    /// Every member `x`.
    fn splat(x: f64) -> Self;
    /// [`f64::min`] of each member with `x`.
    fn min_f(self, x: f64) -> Self;
    /// [`f64::max`] of each member with `x`.
    fn max_f(self, x: f64) -> Self;
    /// [`f64::abs`] of each member.
    fn abs(self) -> Self;
    /// [`f64::min`] of each member with the same member of `o`.
    fn min_t(self, o: Self) -> Self;
    /// The members for which `test` holds, as bits (member m is bit m).
    fn which(self, test: fn(f64) -> bool) -> u32;
}

impl Real for f64 {
    const ALL: u32 = 1;
    #[inline(always)]
    fn splat(x: f64) -> Self {
        x
    }
    #[inline(always)]
    fn min_f(self, x: f64) -> Self {
        self.min(x)
    }
    #[inline(always)]
    fn max_f(self, x: f64) -> Self {
        self.max(x)
    }
    #[inline(always)]
    fn abs(self) -> Self {
        f64::abs(self)
    }
    #[inline(always)]
    fn min_t(self, o: Self) -> Self {
        self.min(o)
    }
    #[inline(always)]
    fn which(self, test: fn(f64) -> bool) -> u32 {
        u32::from(test(self))
    }
}

/// `B` independent values side by side (1 to 32 of them: [`Real::ALL`] holds them as bits).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pack<const B: usize>(pub [f64; B]);

impl<const B: usize> Default for Pack<B> {
    fn default() -> Self {
        Pack([0.0; B])
    }
}

impl<const B: usize> Pack<B> {
    #[inline(always)]
    fn map(self, f: impl Fn(f64) -> f64) -> Self {
        Pack(self.0.map(f))
    }
    #[inline(always)]
    fn zip(self, o: Self, f: impl Fn(f64, f64) -> f64) -> Self {
        let mut out = self.0;
        for (x, y) in out.iter_mut().zip(o.0) {
            *x = f(*x, y);
        }
        Pack(out)
    }
}

/// Member `m` of each pack of `v`, in order.
pub fn member<const B: usize>(v: &[Pack<B>], m: usize) -> impl Iterator<Item = f64> + '_ {
    v.iter().map(move |p| p.0[m])
}

macro_rules! pack_op {
    ($tr:ident, $f:ident, $op:tt) => {
        impl<const B: usize> $tr for Pack<B> {
            type Output = Self;
            #[inline(always)]
            fn $f(self, o: Self) -> Self {
                self.zip(o, |x, y| x $op y)
            }
        }
        impl<const B: usize> $tr<f64> for Pack<B> {
            type Output = Self;
            #[inline(always)]
            fn $f(self, y: f64) -> Self {
                self.map(|x| x $op y)
            }
        }
    };
}
pack_op!(Add, add, +);
pack_op!(Sub, sub, -);
pack_op!(Mul, mul, *);
pack_op!(Div, div, /);

impl<const B: usize> Neg for Pack<B> {
    type Output = Self;
    #[inline(always)]
    fn neg(self) -> Self {
        self.map(|x| -x)
    }
}

impl<const B: usize> AddAssign for Pack<B> {
    #[inline(always)]
    fn add_assign(&mut self, o: Self) {
        *self = *self + o;
    }
}

impl<const B: usize> Real for Pack<B> {
    const ALL: u32 = {
        assert!(B >= 1 && B <= 32, "a pack has 1 to 32 members");
        if B == 32 {
            u32::MAX
        } else {
            (1 << B) - 1
        }
    };
    #[inline(always)]
    fn splat(x: f64) -> Self {
        Pack([x; B])
    }
    #[inline(always)]
    fn min_f(self, y: f64) -> Self {
        self.map(|x| x.min(y))
    }
    #[inline(always)]
    fn max_f(self, y: f64) -> Self {
        self.map(|x| x.max(y))
    }
    #[inline(always)]
    fn abs(self) -> Self {
        self.map(f64::abs)
    }
    #[inline(always)]
    fn min_t(self, o: Self) -> Self {
        self.zip(o, f64::min)
    }
    #[inline(always)]
    fn which(self, test: fn(f64) -> bool) -> u32 {
        self.0
            .iter()
            .enumerate()
            .fold(0, |m, (i, &x)| m | (u32::from(test(x)) << i))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    #[allow(clippy::manual_clamp)] // min then max, as the pack computes it
    fn a_pack_gives_each_member_the_bits_of_plain_arithmetic() {
        let (x, y) = ([0.1, -2.5, 1e-300, 7.0], [3.0, 0.3, -4.0, 1e300]);
        let (p, q) = (Pack(x), Pack(y));
        let got = ((p + q) * p - q / p + (-q)).min_f(0.5).max_f(-1e299).abs() * 2.0;
        for m in 0..4 {
            let want = ((x[m] + y[m]) * x[m] - y[m] / x[m] + (-y[m]))
                .min(0.5)
                .max(-1e299)
                .abs()
                * 2.0;
            assert_eq!(got.0[m].to_bits(), want.to_bits());
        }
        assert_eq!(Pack([1.0, f64::NAN, 0.0]).which(|v| !v.is_finite()), 0b010);
        assert_eq!(f64::NAN.which(f64::is_nan), 1);
        let mut f = Finite::new();
        for v in [
            Pack([1.0, 2.0, f64::INFINITY]),
            Pack([-1e308, f64::NAN, 0.0]),
        ] {
            f.see(v);
        }
        assert_eq!(f.failed(), 0b110);
        let mut one = Finite::new();
        one.see(1e300 * 1e10);
        assert_eq!(one.failed(), 1);
    }
}
