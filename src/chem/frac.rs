//! Exact fractions for per-metal shares of ligands in polynuclear complexes.
//!
//! A ligand shared by n metals gives each of them 1/n of its electrons; keeping the share exact
//! means a symmetric dimer still counts to exactly 18.

use serde::{Serialize, Serializer};

/// An exact rational number of electrons, charges or sites, kept in lowest terms with a
/// positive denominator. Whole numbers (the common case) never touch a gcd.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Frac {
    num: i64,
    den: i64,
}

impl Default for Frac {
    fn default() -> Frac {
        Frac::ZERO
    }
}

fn gcd(mut a: i64, mut b: i64) -> i64 {
    a = a.abs();
    b = b.abs();
    while b != 0 {
        let t = a % b;
        a = b;
        b = t;
    }
    a.max(1)
}

impl Frac {
    pub const ZERO: Frac = Frac { num: 0, den: 1 };

    pub const fn int(n: i64) -> Frac {
        Frac { num: n, den: 1 }
    }

    /// `n / d`; a zero denominator yields zero rather than a panic.
    pub fn new(n: i64, d: i64) -> Frac {
        if d == 0 {
            return Frac::ZERO;
        }
        if d == 1 {
            return Frac::int(n);
        }
        let g = gcd(n, d);
        let (n, d) = (n / g, d / g);
        if d < 0 {
            Frac { num: -n, den: -d }
        } else {
            Frac { num: n, den: d }
        }
    }

    pub fn is_integer(self) -> bool {
        self.den == 1
    }

    /// The integer value when the fraction is whole.
    pub fn as_int(self) -> Option<i64> {
        (self.den == 1).then_some(self.num)
    }

    pub fn floor(self) -> i64 {
        self.num.div_euclid(self.den)
    }

    pub fn to_f64(self) -> f64 {
        self.num as f64 / self.den as f64
    }

    pub fn abs(self) -> Frac {
        Frac {
            num: self.num.abs(),
            den: self.den,
        }
    }

    /// Append the display form to `s`; whole numbers take a fast path.
    pub fn push_to(self, s: &mut String) {
        match self.as_int() {
            Some(n) => push_int(s, n),
            None => s.push_str(&self.to_string()),
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

/// Append a whole number's decimal digits without the formatting machinery.
pub fn push_int(s: &mut String, n: i64) {
    let mut digits = [0u8; 21];
    for &d in int_digits(n, &mut digits) {
        s.push(d as char);
    }
}

/// The decimal digits of `n`, with its sign, written into `buf`: the counting hot path prints
/// many small integers and `format!` costs more than the count itself.
pub fn int_digits(n: i64, buf: &mut [u8; 21]) -> &[u8] {
    let mut i = buf.len();
    let mut m = n.unsigned_abs();
    loop {
        i -= 1;
        buf[i] = b'0' + (m % 10) as u8;
        m /= 10;
        if m == 0 {
            break;
        }
    }
    if n < 0 {
        i -= 1;
        buf[i] = b'-';
    }
    &buf[i..]
}

impl PartialOrd for Frac {
    fn partial_cmp(&self, other: &Frac) -> Option<std::cmp::Ordering> {
        Some(self.cmp(other))
    }
}

impl Ord for Frac {
    fn cmp(&self, other: &Frac) -> std::cmp::Ordering {
        (self.num as i128 * other.den as i128).cmp(&(other.num as i128 * self.den as i128))
    }
}

impl From<i64> for Frac {
    fn from(n: i64) -> Frac {
        Frac::int(n)
    }
}

impl std::ops::Add for Frac {
    type Output = Frac;
    fn add(self, rhs: Frac) -> Frac {
        if self.den == rhs.den {
            if self.den == 1 {
                return Frac::int(self.num + rhs.num);
            }
            return Frac::new(self.num + rhs.num, self.den);
        }
        Frac::new(self.num * rhs.den + rhs.num * self.den, self.den * rhs.den)
    }
}

impl std::ops::Sub for Frac {
    type Output = Frac;
    fn sub(self, rhs: Frac) -> Frac {
        self + (-rhs)
    }
}

impl std::ops::Mul for Frac {
    type Output = Frac;
    fn mul(self, rhs: Frac) -> Frac {
        if self.den == 1 && rhs.den == 1 {
            return Frac::int(self.num * rhs.num);
        }
        Frac::new(self.num * rhs.num, self.den * rhs.den)
    }
}

impl std::ops::Add<i64> for Frac {
    type Output = Frac;
    fn add(self, rhs: i64) -> Frac {
        Frac {
            num: self.num + rhs * self.den,
            den: self.den,
        }
    }
}

impl std::ops::Sub<i64> for Frac {
    type Output = Frac;
    fn sub(self, rhs: i64) -> Frac {
        self + (-rhs)
    }
}

impl std::ops::Mul<i64> for Frac {
    type Output = Frac;
    fn mul(self, rhs: i64) -> Frac {
        if self.den == 1 {
            Frac::int(self.num * rhs)
        } else {
            Frac::new(self.num * rhs, self.den)
        }
    }
}

impl std::ops::Div<i64> for Frac {
    type Output = Frac;
    fn div(self, rhs: i64) -> Frac {
        if rhs == 0 {
            Frac::ZERO
        } else {
            Frac::new(self.num, self.den * rhs)
        }
    }
}

impl std::ops::Neg for Frac {
    type Output = Frac;
    fn neg(self) -> Frac {
        Frac {
            num: -self.num,
            den: self.den,
        }
    }
}

impl std::ops::AddAssign for Frac {
    fn add_assign(&mut self, rhs: Frac) {
        *self = *self + rhs;
    }
}

impl std::iter::Sum for Frac {
    fn sum<I: Iterator<Item = Frac>>(iter: I) -> Frac {
        iter.fold(Frac::ZERO, |a, b| a + b)
    }
}

impl Frac {
    /// As printed, with a + on positive values: how oxidation states and changes are written.
    pub fn signed(self) -> String {
        if self > Frac::ZERO {
            format!("+{self}")
        } else {
            self.to_string()
        }
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
        assert_eq!(Frac::new(2, -4), Frac::new(-1, 2));
        assert!(Frac::new(1, 3) < Frac::new(1, 2));
        assert_eq!(Frac::new(-7, 2).floor(), -4);
        assert_eq!(Frac::new(1, 6) + Frac::new(1, 3), Frac::new(1, 2));
        assert_eq!(Frac::new(2, 3) * Frac::int(3), Frac::int(2));
        assert_eq!(Frac::new(3, 4) - 1, Frac::new(-1, 4));
        for v in [
            Frac::int(0),
            Frac::int(-12),
            Frac::int(1234),
            Frac::new(7, 2),
        ] {
            let mut s = String::new();
            v.push_to(&mut s);
            assert_eq!(s, v.to_string());
        }
    }
}
