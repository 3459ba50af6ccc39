//! Number text for people: what a field shows, what a tick says, and how a
//! typed number is read back. Pure, no web crates.

/// Decimal places that show a value to at least four significant digits,
/// and never fewer than `base` (the unit's usual decimals), at most six.
pub fn field_decimals(v: f64, base: usize) -> usize {
    let a = v.abs();
    if a == 0.0 || !a.is_finite() {
        return base;
    }
    let int_digits = a.log10().floor() as i64 + 1;
    let want = (4 - int_digits).clamp(0, 6) as usize;
    want.max(base).min(6)
}

/// Fixed-point text without a negative zero.
pub fn fixed(v: f64, decimals: usize) -> String {
    let s = format!("{v:.decimals$}");
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s
    }
}

/// The text a numeric field shows for a value already in display units:
/// four significant digits (at least `base` decimals), trailing zeros cut.
/// `68.9476` → `68.95`, `1000.0` → `1000`, `0.92` (in %) as `92`.
pub fn field_text(v: f64, base: usize) -> String {
    if !v.is_finite() {
        return String::new();
    }
    trim_zeros(fixed(v, field_decimals(v, base)))
}

/// Cuts trailing zeros after a decimal point, and the point itself.
pub fn trim_zeros(s: String) -> String {
    if !s.contains('.') {
        return s;
    }
    let t = s.trim_end_matches('0').trim_end_matches('.');
    if t.is_empty() || t == "-" {
        "0".into()
    } else {
        t.to_string()
    }
}

/// Reads a number typed by a person: spaces around it are ignored, and a
/// single decimal comma is read as a point (`68,95`). Only finite values
/// are numbers; `inf`, `NaN` and empty text are not.
pub fn parse_number(text: &str) -> Option<f64> {
    let t = text.trim();
    if t.is_empty() || t.len() > 64 {
        return None;
    }
    let owned;
    let t = if !t.contains('.') && t.matches(',').count() == 1 {
        owned = t.replace(',', ".");
        owned.as_str()
    } else {
        t
    };
    // Rust's parser also reads "inf", "infinity" and "nan": refuse words.
    if t.chars()
        .any(|c| c.is_ascii_alphabetic() && c != 'e' && c != 'E')
    {
        return None;
    }
    t.parse::<f64>().ok().filter(|v| v.is_finite())
}

/// Decimals that a tick step needs: 0 for 50, 1 for 0.5, 2 for 0.25.
pub fn step_decimals(step: f64) -> usize {
    if !(step.is_finite() && step > 0.0) {
        return 0;
    }
    let mut d = 0;
    let mut s = step;
    while d < 6 && (s - s.round()).abs() > 1e-9 * s.max(1.0) {
        s *= 10.0;
        d += 1;
    }
    d
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn field_text_table() {
        // (value in display units, unit decimals, text)
        let table = [
            (68.947_572_931_683_6, 1, "68.95"),
            (1000.0, 0, "1000"),
            (435.113_188, 0, "435.1"),
            (30.0, 1, "30"),
            (3.937_007_874, 2, "3.937"),
            (0.5, 1, "0.5"),
            (0.012_346, 1, "0.01235"),
            (22_480.894, 0, "22481"),
            (-0.000_000_1, 1, "0"),
            (0.0, 1, "0"),
            (92.0, 1, "92"),
        ];
        for (v, base, want) in table {
            assert_eq!(field_text(v, base), want, "{v} with {base} decimals");
        }
        assert_eq!(field_text(f64::NAN, 1), "");
    }

    #[test]
    fn fixed_has_no_negative_zero() {
        assert_eq!(fixed(-0.0001, 2), "0.00");
        assert_eq!(fixed(-0.5, 1), "-0.5");
        assert_eq!(fixed(2.6, 0), "3");
    }

    #[test]
    fn parse_table() {
        let ok = [
            ("68.95", 68.95),
            (" 1000 ", 1000.0),
            ("68,95", 68.95),
            ("1e3", 1000.0),
            ("-2", -2.0),
            (".5", 0.5),
            ("+7", 7.0),
        ];
        for (t, v) in ok {
            assert_eq!(parse_number(t), Some(v), "{t:?}");
        }
        for t in [
            "", "  ", "abc", "1,000.5", "1,2,3", "inf", "NaN", "1e999", "12 bar", "0x10",
        ] {
            assert_eq!(parse_number(t), None, "{t:?}");
        }
    }

    #[test]
    fn step_decimals_table() {
        for (s, d) in [
            (50.0, 0),
            (1.0, 0),
            (0.5, 1),
            (0.25, 2),
            (0.002, 3),
            (2e-7, 6),
        ] {
            assert_eq!(step_decimals(s), d, "{s}");
        }
    }
}
