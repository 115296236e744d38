//! Exact fractions for per-metal shares of ligands in polynuclear complexes.
//!
//! A ligand shared by n metals gives each of them 1/n of its electrons; keeping the share exact
//! means a symmetric dimer still counts to exactly 18.

use num_rational::Ratio;
use serde::{Serialize, Serializer};

/// An exact rational number of electrons, charges or sites.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
pub struct Frac(Ratio<i64>);

impl Frac {
    pub const ZERO: Frac = Frac(Ratio::new_raw(0, 1));

    pub fn int(n: i64) -> Frac {
        Frac(Ratio::from_integer(n))
    }

    /// `n / d`; a zero denominator yields zero rather than a panic.
    pub fn new(n: i64, d: i64) -> Frac {
        if d == 0 {
            Frac::ZERO
        } else {
            Frac(Ratio::new(n, d))
        }
    }

    pub fn is_integer(self) -> bool {
        self.0.is_integer()
    }

    /// The integer value when the fraction is whole.
    pub fn as_int(self) -> Option<i64> {
        self.is_integer().then(|| self.0.to_integer())
    }

    pub fn floor(self) -> i64 {
        self.0.floor().to_integer()
    }

    pub fn to_f64(self) -> f64 {
        *self.0.numer() as f64 / *self.0.denom() as f64
    }

    pub fn abs(self) -> Frac {
        if self.0 < Ratio::from_integer(0) {
            Frac(-self.0)
        } else {
            self
        }
    }

    pub fn max(self, other: Frac) -> Frac {
        if self >= other {
            self
        } else {
            other
        }
    }

    pub fn min(self, other: Frac) -> Frac {
        if self <= other {
            self
        } else {
            other
        }
    }
}

impl From<i64> for Frac {
    fn from(n: i64) -> Frac {
        Frac::int(n)
    }
}

macro_rules! op {
    ($tr:ident, $f:ident, $op:tt) => {
        impl std::ops::$tr for Frac {
            type Output = Frac;
            fn $f(self, rhs: Frac) -> Frac {
                Frac(self.0 $op rhs.0)
            }
        }
        impl std::ops::$tr<i64> for Frac {
            type Output = Frac;
            fn $f(self, rhs: i64) -> Frac {
                Frac(self.0 $op Ratio::from_integer(rhs))
            }
        }
    };
}
op!(Add, add, +);
op!(Sub, sub, -);
op!(Mul, mul, *);

impl std::ops::Div<i64> for Frac {
    type Output = Frac;
    fn div(self, rhs: i64) -> Frac {
        if rhs == 0 {
            Frac::ZERO
        } else {
            Frac(self.0 / Ratio::from_integer(rhs))
        }
    }
}

impl std::ops::Neg for Frac {
    type Output = Frac;
    fn neg(self) -> Frac {
        Frac(-self.0)
    }
}

impl std::ops::AddAssign for Frac {
    fn add_assign(&mut self, rhs: Frac) {
        self.0 += rhs.0;
    }
}

impl std::iter::Sum for Frac {
    fn sum<I: Iterator<Item = Frac>>(iter: I) -> Frac {
        iter.fold(Frac::ZERO, |a, b| a + b)
    }
}

/// Whole numbers print as integers, others with up to two decimals ("17.5", "14.33").
impl std::fmt::Display for Frac {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.as_int() {
            Some(n) => write!(f, "{n}"),
            None => {
                let s = format!("{:.2}", self.to_f64());
                write!(f, "{}", s.trim_end_matches('0'))
            }
        }
    }
}

/// JSON: an integer when whole, otherwise a float rounded to four decimals.
impl Serialize for Frac {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        match self.as_int() {
            Some(n) => s.serialize_i64(n),
            None => s.serialize_f64((self.to_f64() * 1e4).round() / 1e4),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shares_add_back_to_whole_numbers() {
        let half = Frac::new(9, 2);
        assert_eq!((half + half).as_int(), Some(9));
        assert_eq!(Frac::new(43, 3).to_string(), "14.33");
        assert_eq!(Frac::new(35, 2).to_string(), "17.5");
        assert_eq!(Frac::int(-2).to_string(), "-2");
        assert_eq!(Frac::new(1, 0), Frac::ZERO);
    }
}
