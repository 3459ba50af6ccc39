//! What the inputs show and how typed text becomes a design value. Pure,
//! no web crates: the views call these and only draw.
//!
//! **Invariant:** the SI value is the source of truth. A field's text is
//! derived from it, except while the person's own typing is on screen (a
//! [`Draft`]); toggling units never re-parses, so it never changes the
//! design.

use kneepoint_engine::fields::FieldSpec;
use kneepoint_engine::units::{from_display, to_display, unit};
use kneepoint_engine::UnitSystem;

use crate::fmt::{field_text, parse_number, step_decimals};
use crate::ticks::nice_step;

/// Text a person typed into one field, with the unit system and the load
/// generation it was typed under. It is shown only while both still hold.
#[derive(Clone, Debug, PartialEq)]
pub struct Draft {
    /// Units at the time of typing.
    pub units: UnitSystem,
    /// Design load counter at the time of typing (a preset, a link or a
    /// file loaded since makes the draft stale).
    pub generation: u64,
    /// The text as typed.
    pub text: String,
}

/// The SI value shown in the field's display unit.
pub fn value_text(spec: &FieldSpec, units: UnitSystem, si: f64) -> String {
    let u = unit(spec.quantity, units);
    field_text(to_display(spec.quantity, units, si), u.decimals)
}

/// What a field shows: the draft if it is current, otherwise the value.
pub fn visible_text(
    spec: &FieldSpec,
    units: UnitSystem,
    generation: u64,
    si: f64,
    draft: Option<&Draft>,
) -> String {
    match draft {
        Some(d) if d.units == units && d.generation == generation => d.text.clone(),
        _ => value_text(spec, units, si),
    }
}

/// Reads typed text as an SI value.
///
/// # Errors
/// A message for the field when the text is not a number.
pub fn parse_field(
    spec: &FieldSpec,
    units: UnitSystem,
    text: &str,
) -> Result<f64, String> {
    match parse_number(text) {
        Some(v) => Ok(from_display(spec.quantity, units, v)),
        None => Err(format!(
            "Enter a number in {}.",
            match unit(spec.quantity, units).symbol {
                "" => "plain figures",
                s => s,
            }
        )),
    }
}

/// A slider in display units: round ends and a round step.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Slider {
    /// Lowest position.
    pub min: f64,
    /// Highest position.
    pub max: f64,
    /// Step between positions.
    pub step: f64,
}

impl Slider {
    /// Text for an `<input type=range>` attribute.
    pub fn attr(&self, v: f64) -> String {
        crate::fmt::fixed(v, step_decimals(self.step))
    }
}

/// The slider of `spec` in `units`: the engine's range in display units,
/// widened to the nearest step (at most one step) so positions are round.
pub fn slider(spec: &FieldSpec, units: UnitSystem) -> Slider {
    let lo = to_display(spec.quantity, units, spec.min);
    let hi = to_display(spec.quantity, units, spec.max);
    let step = nice_step(hi - lo, 250);
    Slider {
        min: (lo / step).floor() * step,
        max: (hi / step).ceil() * step,
        step,
    }
}

/// The slider position for an SI value: display units, clamped.
pub fn slider_position(spec: &FieldSpec, units: UnitSystem, si: f64) -> f64 {
    let s = slider(spec, units);
    to_display(spec.quantity, units, si).clamp(s.min, s.max)
}

/// The SI value of a slider position (the position text from the browser).
pub fn from_slider(spec: &FieldSpec, units: UnitSystem, text: &str) -> Option<f64> {
    parse_number(text).map(|v| from_display(spec.quantity, units, v))
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::fields::{spec, FIELDS};
    use kneepoint_engine::units::PSI;

    fn unloading() -> &'static FieldSpec {
        spec("unloading_valve.setting_pa").expect("the unloading setting is a field")
    }

    #[test]
    fn thousand_psi_reads_68_95_bar_and_back() {
        let s = unloading();
        let si = parse_field(s, UnitSystem::Us, "1000").unwrap();
        assert_eq!(si, 1000.0 * PSI);
        assert_eq!(value_text(s, UnitSystem::Metric, si), "68.95");
        assert_eq!(value_text(s, UnitSystem::Us, si), "1000");
    }

    #[test]
    fn toggling_units_never_changes_the_value() {
        // Every default, shown in the other system and back, shows the
        // same text: the value is never re-parsed.
        for s in FIELDS {
            let m = value_text(s, UnitSystem::Metric, s.default);
            let _ = value_text(s, UnitSystem::Us, s.default);
            assert_eq!(value_text(s, UnitSystem::Metric, s.default), m);
        }
    }

    #[test]
    fn drafts_show_only_while_current() {
        let s = unloading();
        let d = Draft {
            units: UnitSystem::Us,
            generation: 3,
            text: "10".into(),
        };
        // Current: the typed text, even if it would format differently.
        assert_eq!(visible_text(s, UnitSystem::Us, 3, 2.0e6, Some(&d)), "10");
        // Units toggled since: the value, in the new units.
        assert_eq!(
            visible_text(s, UnitSystem::Metric, 3, 2.0e6, Some(&d)),
            "20"
        );
        // A design loaded since: the value.
        assert_eq!(visible_text(s, UnitSystem::Us, 4, 2.0e6, Some(&d)), "290.1");
        assert_eq!(visible_text(s, UnitSystem::Us, 4, 2.0e6, None), "290.1");
    }

    #[test]
    fn bad_text_names_the_unit() {
        let s = unloading();
        assert_eq!(
            parse_field(s, UnitSystem::Metric, "abc"),
            Err("Enter a number in bar.".into())
        );
        assert_eq!(
            parse_field(s, UnitSystem::Us, ""),
            Err("Enter a number in psi.".into())
        );
    }

    #[test]
    fn sliders_hold_the_engine_range_on_round_steps() {
        for s in FIELDS {
            for units in [UnitSystem::Metric, UnitSystem::Us] {
                let sl = slider(s, units);
                let lo = to_display(s.quantity, units, s.min);
                let hi = to_display(s.quantity, units, s.max);
                assert!(sl.min <= lo + 1e-9 && sl.max >= hi - 1e-9, "{}", s.path);
                assert!(lo - sl.min < sl.step + 1e-9 && sl.max - hi < sl.step + 1e-9);
                let n = (sl.max - sl.min) / sl.step;
                assert!(
                    (100.0..=260.0).contains(&n),
                    "{} {units:?}: {n} steps",
                    s.path
                );
                let d = slider_position(s, units, s.default);
                assert!(d >= sl.min && d <= sl.max);
            }
        }
        let sl = slider(unloading(), UnitSystem::Metric);
        assert_eq!((sl.min, sl.max, sl.step), (5.0, 120.0, 0.5));
        assert_eq!(
            from_slider(unloading(), UnitSystem::Metric, "45"),
            Some(45.0e5)
        );
        assert_eq!(slider_position(unloading(), UnitSystem::Metric, 1e9), 120.0);
    }
}
