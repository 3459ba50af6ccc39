//! Typed errors: what is wrong, in which field, and what to change.

use std::fmt;

use serde::Serialize;

use crate::units::{format, Quantity, UnitSystem};

/// Why one field of a design (or of readings) is not usable.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[non_exhaustive]
pub enum ErrorKind {
    /// Not a number or infinite.
    NotFinite,
    /// Must be greater than zero.
    NotPositive {
        /// What the value is.
        quantity: Quantity,
    },
    /// Must be zero or more.
    Negative {
        /// What the value is.
        quantity: Quantity,
    },
    /// Outside an allowed closed or half-open range.
    OutOfRange {
        /// What the value is.
        quantity: Quantity,
        /// Lowest allowed value (SI).
        min: f64,
        /// Highest allowed value (SI).
        max: f64,
    },
    /// An efficiency or fraction must lie in (0, 1].
    EfficiencyOutOfRange,
    /// The rod is as large as the bore or larger.
    RodNotSmallerThanBore {
        /// The bore (m).
        bore_m: f64,
    },
    /// Relief full-flow pressure below its cracking pressure.
    FullFlowBelowCracking {
        /// The cracking pressure (Pa).
        cracking_pa: f64,
    },
    /// Relief full-flow pressure at or below the unloading setting.
    ReliefNotAboveUnloading {
        /// The unloading setting (Pa).
        unloading_pa: f64,
    },
    /// The design file format is not one this engine reads.
    UnsupportedFormat {
        /// The format number found.
        found: u32,
        /// The format this engine reads.
        supported: u32,
    },
    /// A reading that contradicts the design (e.g. longer than the stroke).
    Inconsistent {
        /// What is wrong, in words.
        why: String,
    },
}

/// One problem in one field.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FieldError {
    /// Dotted path of the field in the design file, e.g. `cylinder.rod_m`.
    /// Inside a list the index is left out (`cycle.segments[].distance_m`)
    /// and held in `index`; [`FieldError::path`] puts it back.
    pub field: &'static str,
    /// Position in the list the field belongs to, if it is in one.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub index: Option<usize>,
    /// The value found (SI), when there is one.
    pub value: f64,
    /// What is wrong.
    pub kind: ErrorKind,
}

impl FieldError {
    /// The full path with the list index, e.g. `cycle.segments[2].distance_m`.
    pub fn path(&self) -> String {
        match self.index {
            Some(i) => self.field.replacen("[]", &format!("[{i}]"), 1),
            None => self.field.to_string(),
        }
    }

    /// The message for people, with numbers in `units`, saying what to change.
    pub fn message(&self, units: UnitSystem) -> String {
        use ErrorKind::*;
        match &self.kind {
            NotFinite => "Enter a number.".into(),
            NotPositive { .. } => "Must be greater than zero.".into(),
            Negative { .. } => "Must be zero or more.".into(),
            OutOfRange { quantity, min, max } => format!(
                "Must be between {} and {}.",
                format(*quantity, units, *min),
                format(*quantity, units, *max)
            ),
            EfficiencyOutOfRange => {
                "Must be more than 0 % and at most 100 %.".into()
            }
            RodNotSmallerThanBore { bore_m } => format!(
                "The rod must be smaller than the bore ({}); choose a thinner rod or a larger bore.",
                format(Quantity::Length, units, *bore_m)
            ),
            FullFlowBelowCracking { cracking_pa } => format!(
                "Full-flow pressure must be above the cracking pressure ({}).",
                format(Quantity::Pressure, units, *cracking_pa)
            ),
            ReliefNotAboveUnloading { unloading_pa } => format!(
                "The relief must be set above the unloading setting ({}); otherwise the large pump never unloads. Raise the relief or lower the unloading setting.",
                format(Quantity::Pressure, units, *unloading_pa)
            ),
            UnsupportedFormat { found, supported } => format!(
                "This file is format {found}; Kneepoint reads format {supported}."
            ),
            Inconsistent { why } => why.clone(),
        }
    }
}

impl fmt::Display for FieldError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.path(), self.message(UnitSystem::Metric))
    }
}

/// Every problem found in a design at once, so all fields can be marked.
#[derive(Clone, Debug, PartialEq, Serialize, Default)]
pub struct ValidationErrors(pub Vec<FieldError>);

impl ValidationErrors {
    /// The first error for `field`, if any; `field` may be the bare path
    /// (`cycle.segments[].distance_m`) or the indexed one (`...[2]...`).
    pub fn for_field(&self, field: &str) -> Option<&FieldError> {
        self.0
            .iter()
            .find(|e| e.field == field || (e.index.is_some() && e.path() == field))
    }
    /// True when there is no error.
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
}

impl fmt::Display for ValidationErrors {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, e) in self.0.iter().enumerate() {
            if i > 0 {
                writeln!(f)?;
            }
            write!(f, "{e}")?;
        }
        Ok(())
    }
}

impl std::error::Error for ValidationErrors {}

/// Collects field errors while validating.
#[derive(Default)]
pub(crate) struct Checker {
    pub(crate) errors: Vec<FieldError>,
    /// List index given to every error pushed while it is set.
    pub(crate) index: Option<usize>,
}

impl Checker {
    pub(crate) fn push(&mut self, field: &'static str, value: f64, kind: ErrorKind) {
        self.errors.push(FieldError {
            field,
            index: self.index,
            value,
            kind,
        });
    }

    /// Finite and > 0. Returns whether it passed.
    pub(crate) fn positive(&mut self, field: &'static str, q: Quantity, v: f64) -> bool {
        if !v.is_finite() {
            self.push(field, v, ErrorKind::NotFinite);
            false
        } else if v <= 0.0 {
            self.push(field, v, ErrorKind::NotPositive { quantity: q });
            false
        } else {
            true
        }
    }

    /// Finite and >= 0. Returns whether it passed.
    pub(crate) fn non_negative(
        &mut self,
        field: &'static str,
        q: Quantity,
        v: f64,
    ) -> bool {
        if !v.is_finite() {
            self.push(field, v, ErrorKind::NotFinite);
            false
        } else if v < 0.0 {
            self.push(field, v, ErrorKind::Negative { quantity: q });
            false
        } else {
            true
        }
    }

    /// Finite and within [min, max].
    pub(crate) fn range(
        &mut self,
        field: &'static str,
        q: Quantity,
        v: f64,
        min: f64,
        max: f64,
    ) -> bool {
        if !v.is_finite() {
            self.push(field, v, ErrorKind::NotFinite);
            false
        } else if v < min || v > max {
            self.push(
                field,
                v,
                ErrorKind::OutOfRange {
                    quantity: q,
                    min,
                    max,
                },
            );
            false
        } else {
            true
        }
    }

    /// Finite and within (0, 1].
    pub(crate) fn efficiency(&mut self, field: &'static str, v: f64) -> bool {
        if !v.is_finite() {
            self.push(field, v, ErrorKind::NotFinite);
            false
        } else if v <= 0.0 || v > 1.0 {
            self.push(field, v, ErrorKind::EfficiencyOutOfRange);
            false
        } else {
            true
        }
    }

    pub(crate) fn finish(self) -> Result<(), ValidationErrors> {
        if self.errors.is_empty() {
            Ok(())
        } else {
            Err(ValidationErrors(self.errors))
        }
    }
}

/// Why an operating point could not be found.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
#[non_exhaustive]
pub enum SolveError {
    /// The relief full-flow pressure cannot produce the force asked for.
    ForceNotReachable {
        /// Force asked for (N).
        force_n: f64,
        /// Largest force at relief full-flow pressure and zero speed (N).
        max_force_n: f64,
    },
    /// A pressure outside 0 ..= relief full-flow pressure was asked for.
    PressureOutOfRange {
        /// The pressure asked for (Pa).
        pressure_pa: f64,
    },
}

impl SolveError {
    /// The message for people in `units`.
    pub fn message(&self, units: UnitSystem) -> String {
        match self {
            SolveError::ForceNotReachable { force_n, max_force_n } => format!(
                "Force not reachable: {} asked for, at most {} at relief full flow. Raise the relief (within component ratings) or use a larger bore.",
                format(Quantity::Force, units, *force_n),
                format(Quantity::Force, units, *max_force_n)
            ),
            SolveError::PressureOutOfRange { pressure_pa } => format!(
                "Pressure {} is outside zero to relief full flow.",
                format(Quantity::Pressure, units, *pressure_pa)
            ),
        }
    }
}

impl fmt::Display for SolveError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message(UnitSystem::Metric))
    }
}

impl std::error::Error for SolveError {}
