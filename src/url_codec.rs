//! The design and the unit choice in the page address, so a link opens
//! exactly what its sender saw (format: `docs/url-format.md`).
//!
//! The fragment (after `#`) holds `&`-separated `key=value` pairs:
//!
//! ```text
//! v=1&u=metric&base=workshop-press&d=eyJ1bmxvYWRpbmdfdmFsdmUiOnsic2V0dGluZ19wYSI6NDUwMDAwMC4wfX0
//! ```
//!
//! `d` is base64url (RFC 4648 §5, no padding) of a JSON Merge Patch
//! (RFC 7396) that turns the named demo design into this one: only what
//! differs travels. Because it patches the design file's JSON, whatever the
//! design carries (duty cycle, faults, anything added later) travels too,
//! and the result is read by the same reader as a design file.
//!
//! The bases are frozen: [`LINK_BASES`] holds each demo design's file as it
//! was when link version 1 was defined (`src/link_bases/*.json`), so editing
//! a demo design later never changes what an old link opens. A new base gets
//! a new name; a design-file field added later must have a serde default, as
//! for any older design file.
//!
//! Decoding never panics and never runs anything: the text only becomes a
//! [`Design`] through serde, or an error.

use kneepoint_engine::design::Design;
use kneepoint_engine::io;
use kneepoint_engine::UnitSystem;
use serde_json::{Map, Value};

use crate::base64url;

/// The frozen bases of link version 1: name and design file text. The
/// first is the default when a link names none.
pub const LINK_BASES: &[(&str, &str)] = &[
    (
        "workshop-press",
        include_str!("link_bases/workshop-press.json"),
    ),
    ("baler", include_str!("link_bases/baler.json")),
    ("clamp", include_str!("link_bases/clamp.json")),
];

/// The JSON of the frozen base `name`.
fn base_value(name: &str) -> Option<Value> {
    LINK_BASES
        .iter()
        .find(|(n, _)| *n == name)
        .and_then(|(_, text)| serde_json::from_str(text).ok())
}

/// Version of the link format written here.
pub const LINK_VERSION: u32 = 1;

/// Longest fragment read (characters); a longer one is refused unread.
pub const MAX_FRAGMENT: usize = 64 * 1024;

/// What a link carries.
#[derive(Clone, Debug, PartialEq)]
pub struct Shared {
    /// The whole design.
    pub design: Design,
    /// Metric or US units.
    pub units: UnitSystem,
    /// Which view was open (`None` when the link names none).
    pub view: Option<String>,
}

/// Why a link could not be read.
#[derive(Clone, Debug, PartialEq)]
pub enum LinkError {
    /// Longer than [`MAX_FRAGMENT`].
    TooLong,
    /// No `v=` version.
    NoVersion,
    /// A version this app does not read.
    UnsupportedVersion(String),
    /// `u=` is not `metric` or `us`.
    UnknownUnits(String),
    /// `base=` names no demo design.
    UnknownBase(String),
    /// `d=` is not base64url.
    BadEncoding,
    /// The decoded patch is not JSON, or not an object.
    BadPatch(String),
    /// The patched design is not a design file this app reads.
    NotADesign(String),
}

impl LinkError {
    /// The notice shown to people.
    pub fn message(&self) -> String {
        let what = match self {
            LinkError::TooLong => "it is too long".to_string(),
            LinkError::NoVersion => "it has no format version".to_string(),
            LinkError::UnsupportedVersion(v) => {
                format!(
                    "it is link format {v:.12}; this version reads format {LINK_VERSION}"
                )
            }
            LinkError::UnknownUnits(u) => format!("the unit choice “{u:.12}” is unknown"),
            LinkError::UnknownBase(b) => {
                format!("it names an unknown demo design “{b:.24}”")
            }
            LinkError::BadEncoding => "its design data is damaged".to_string(),
            LinkError::BadPatch(e) => format!("its design data is damaged ({e:.80})"),
            LinkError::NotADesign(e) => format!("its design is not readable ({e:.120})"),
        };
        format!(
            "This link could not be opened: {what}. The demo design is shown instead."
        )
    }
}

fn units_code(u: UnitSystem) -> &'static str {
    match u {
        UnitSystem::Metric => "metric",
        UnitSystem::Us => "us",
    }
}

/// Writes the fragment (without `#`) for `design` in `units`, patched
/// from whichever demo design gives the shortest link.
pub fn encode(design: &Design, units: UnitSystem, view: Option<&str>) -> String {
    let target = to_value(design);
    let mut best: (usize, Option<String>) = (0, None);
    for (i, (name, _)) in LINK_BASES.iter().enumerate() {
        let Some(base) = base_value(name) else {
            continue;
        };
        let d = match diff(&base, &target) {
            None => String::new(),
            Some(p) => base64url::encode(p.to_string().as_bytes()),
        };
        if best.1.as_ref().is_none_or(|b| d.len() < b.len()) {
            best = (i, Some(d));
        }
    }
    let (i, d) = (best.0, best.1.unwrap_or_default());
    let mut s = format!(
        "v={LINK_VERSION}&u={}&base={}",
        units_code(units),
        LINK_BASES.get(i).map_or("", |b| b.0)
    );
    if let Some(v) = view {
        s.push_str("&view=");
        s.push_str(v);
    }
    if !d.is_empty() {
        s.push_str("&d=");
        s.push_str(&d);
    }
    s
}

/// Reads a fragment (with or without the leading `#`).
///
/// # Errors
/// [`LinkError`] for anything that is not a link written by [`encode`]
/// (or by hand to the same format). Unknown keys are ignored so that later
/// versions can add some.
pub fn decode(fragment: &str) -> Result<Shared, LinkError> {
    let f = fragment.strip_prefix('#').unwrap_or(fragment);
    if f.len() > MAX_FRAGMENT {
        return Err(LinkError::TooLong);
    }
    let (mut version, mut units, mut base, mut data, mut view) =
        (None, None, None, None, None);
    for pair in f.split('&').filter(|p| !p.is_empty()) {
        let (k, v) = pair.split_once('=').unwrap_or((pair, ""));
        let slot = match k {
            "v" => &mut version,
            "u" => &mut units,
            "base" => &mut base,
            "d" => &mut data,
            "view" => &mut view,
            _ => continue,
        };
        if slot.is_none() {
            *slot = Some(v);
        }
    }
    match version {
        None => return Err(LinkError::NoVersion),
        Some(v) if v != LINK_VERSION.to_string() => {
            return Err(LinkError::UnsupportedVersion(v.to_string()))
        }
        Some(_) => {}
    }
    let units = match units {
        None => UnitSystem::Metric,
        Some("metric") => UnitSystem::Metric,
        Some("us") => UnitSystem::Us,
        Some(u) => return Err(LinkError::UnknownUnits(u.to_string())),
    };
    let base_name = base.unwrap_or(LINK_BASES[0].0);
    let mut doc = base_value(base_name)
        .ok_or_else(|| LinkError::UnknownBase(base_name.to_string()))?;
    if let Some(d) = data.filter(|d| !d.is_empty()) {
        let bytes = base64url::decode(d).ok_or(LinkError::BadEncoding)?;
        let text = String::from_utf8(bytes).map_err(|_| LinkError::BadEncoding)?;
        let patch: Value = serde_json::from_str(&text)
            .map_err(|e| LinkError::BadPatch(e.to_string()))?;
        if !patch.is_object() {
            return Err(LinkError::BadPatch("not an object".into()));
        }
        merge_patch(&mut doc, &patch);
    }
    let design = io::parse_design(&doc.to_string())
        .map_err(|e| LinkError::NotADesign(e.message.clone()))?;
    if design.format != kneepoint_engine::DESIGN_FORMAT {
        return Err(LinkError::NotADesign(format!(
            "design format {} is not {}",
            design.format,
            kneepoint_engine::DESIGN_FORMAT
        )));
    }
    let view = view
        .filter(|v| {
            v.len() <= 24 && v.bytes().all(|b| b.is_ascii_lowercase() || b == b'-')
        })
        .map(str::to_string);
    Ok(Shared {
        design,
        units,
        view,
    })
}

fn to_value(d: &Design) -> Value {
    // Through the design file's own text: one serialiser in the app, and the
    // link patches exactly what a design file holds.
    serde_json::from_str(&io::design_to_json(d)).unwrap_or(Value::Null)
}

/// Leaf equality that tells 0.0 from −0.0, so a round trip is exact.
fn same(a: &Value, b: &Value) -> bool {
    match (a, b) {
        (Value::Number(x), Value::Number(y)) => x.to_string() == y.to_string(),
        _ => a == b,
    }
}

/// The JSON Merge Patch (RFC 7396) that turns `base` into `target`, or
/// `None` when they are equal. A key missing from `target` becomes `null`
/// (remove); a `null` in `target` also travels as `null`, and the design
/// reader takes a missing optional field as `None`.
pub fn diff(base: &Value, target: &Value) -> Option<Value> {
    match (base, target) {
        (Value::Object(b), Value::Object(t)) => {
            let mut out = Map::new();
            for (k, tv) in t {
                match b.get(k) {
                    Some(bv) => {
                        if let Some(d) = diff(bv, tv) {
                            out.insert(k.clone(), d);
                        }
                    }
                    None if tv.is_null() => {}
                    None => {
                        out.insert(k.clone(), tv.clone());
                    }
                }
            }
            for k in b.keys() {
                if !t.contains_key(k) {
                    out.insert(k.clone(), Value::Null);
                }
            }
            (!out.is_empty()).then_some(Value::Object(out))
        }
        (Value::Array(x), Value::Array(y))
            if x.len() == y.len()
                && x.iter().zip(y).all(|(a, b)| diff(a, b).is_none()) =>
        {
            None
        }
        _ if same(base, target) && !base.is_array() && !base.is_object() => None,
        _ => Some(target.clone()),
    }
}

/// Applies a JSON Merge Patch (RFC 7396 §2, the MergePatch procedure).
pub fn merge_patch(target: &mut Value, patch: &Value) {
    let Value::Object(p) = patch else {
        *target = patch.clone();
        return;
    };
    if !target.is_object() {
        *target = Value::Object(Map::new());
    }
    if let Value::Object(t) = target {
        for (k, v) in p {
            if v.is_null() {
                t.remove(k);
            } else {
                merge_patch(t.entry(k.clone()).or_insert(Value::Null), v);
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::design::{Hose, EXAMPLES};
    use proptest::prelude::*;
    use serde_json::json;

    /// RFC 7396 Appendix A examples (a selection), applied by [`merge_patch`].
    #[test]
    fn rfc7396_examples() {
        let table = [
            (json!({"a":"b"}), json!({"a":"c"}), json!({"a":"c"})),
            (json!({"a":"b"}), json!({"b":"c"}), json!({"a":"b","b":"c"})),
            (json!({"a":"b"}), json!({"a":null}), json!({})),
            (
                json!({"a":"b","b":"c"}),
                json!({"a":null}),
                json!({"b":"c"}),
            ),
            (json!({"a":["b"]}), json!({"a":"c"}), json!({"a":"c"})),
            (json!({"a":"c"}), json!({"a":["b"]}), json!({"a":["b"]})),
            (
                json!({"a":{"b":"c"}}),
                json!({"a":{"b":"d","c":null}}),
                json!({"a":{"b":"d"}}),
            ),
            (json!({"a":[{"b":"c"}]}), json!({"a":[1]}), json!({"a":[1]})),
            (json!(["a", "b"]), json!(["c", "d"]), json!(["c", "d"])),
            (json!({"a":"b"}), json!(["c"]), json!(["c"])),
            (json!({"e":null}), json!({"a":1}), json!({"e":null,"a":1})),
            (json!([1, 2]), json!({"a":"b","c":null}), json!({"a":"b"})),
            (
                json!({}),
                json!({"a":{"bb":{"ccc":null}}}),
                json!({"a":{"bb":{}}}),
            ),
        ];
        for (doc, patch, want) in table {
            let mut d = doc.clone();
            merge_patch(&mut d, &patch);
            assert_eq!(d, want, "{doc} + {patch}");
        }
    }

    /// Old links must keep opening what they opened: each frozen base is a
    /// valid design file, a link naming it opens exactly that file, and the
    /// bases are the demo names.
    #[test]
    fn frozen_bases_open_exactly_their_file() {
        assert_eq!(LINK_BASES.len(), EXAMPLES.len());
        for (name, text) in LINK_BASES {
            let file = io::parse_design(text).expect("frozen base parses");
            kneepoint_engine::Circuit::new(&file).expect("frozen base is valid");
            let back = decode(&format!("v=1&base={name}")).expect("base link");
            assert_eq!(back.design, file, "{name}");
            assert!(EXAMPLES.iter().any(|e| e.name == *name), "{name}");
        }
    }

    #[test]
    fn unchanged_demo_gives_a_short_link() {
        for ex in EXAMPLES {
            let d = (ex.build)();
            let s = encode(&d, UnitSystem::Us, None);
            assert_eq!(s, format!("v=1&u=us&base={}", ex.name));
            let back = decode(&s).expect("own link");
            assert_eq!(back.design, d);
            assert_eq!(back.units, UnitSystem::Us);
        }
    }

    #[test]
    fn one_change_travels_as_a_small_patch() {
        let mut d = Design::default();
        d.unloading_valve.setting_pa = 45.0e5;
        let s = encode(&d, UnitSystem::Metric, Some("circuit"));
        assert!(s.len() < 120, "{s}");
        let back = decode(&format!("#{s}")).expect("own link");
        assert_eq!(back.design, d);
        assert_eq!(back.view.as_deref(), Some("circuit"));
    }

    #[test]
    fn options_and_negative_zero_travel_exactly() {
        let mut d = Design::default();
        d.lines.pressure_hose = None;
        d.drive.motor_rating_w = Some(7500.0);
        d.ratings.large_pump_relief_pa = Some(55.5e5);
        d.loads.approach_force_n = -0.0;
        d.name = "Press & <b>line</b> \"2\"".into();
        let back = decode(&encode(&d, UnitSystem::Metric, None)).expect("own link");
        assert_eq!(back.design, d);
        assert!(back.design.loads.approach_force_n.is_sign_negative());
        let mut e = d.clone();
        e.lines.pressure_hose = Some(Hose {
            bore_m: 0.01,
            length_m: 1.0,
        });
        assert_eq!(
            decode(&encode(&e, UnitSystem::Us, None)).map(|s| s.design),
            Ok(e)
        );
    }

    #[test]
    fn broken_links_are_errors() {
        let good = encode(&Design::default(), UnitSystem::Metric, None);
        type Expect = fn(&LinkError) -> bool;
        let table: [(&str, Expect); 9] = [
            ("", |e| *e == LinkError::NoVersion),
            ("u=us", |e| *e == LinkError::NoVersion),
            ("v=9", |e| matches!(e, LinkError::UnsupportedVersion(_))),
            ("v=1&u=furlong", |e| matches!(e, LinkError::UnknownUnits(_))),
            ("v=1&base=nope", |e| matches!(e, LinkError::UnknownBase(_))),
            ("v=1&d=%%%", |e| *e == LinkError::BadEncoding),
            ("v=1&d=WzFd", |e| matches!(e, LinkError::BadPatch(_))), // [1]
            ("v=1&d=eyJ4IjoxfQ", |e| {
                matches!(e, LinkError::NotADesign(_))
            }), // {"x":1}
            ("v=1&d=eyJmb3JtYXQiOjJ9", |e| {
                matches!(e, LinkError::NotADesign(_))
            }), // {"format":2}
        ];
        for (link, ok) in table {
            let e = decode(link).expect_err(link);
            assert!(ok(&e), "{link}: {e:?}");
            assert!(e.message().contains("demo design"));
        }
        assert!(
            decode(&format!("{good}&later=1")).is_ok(),
            "unknown keys are ignored"
        );
        assert_eq!(decode(&"v=1&".repeat(20_000)), Err(LinkError::TooLong));
    }

    fn finite() -> impl Strategy<Value = f64> {
        prop_oneof![
            -1.0e9..1.0e9f64,
            any::<f64>().prop_filter("finite", |v| v.is_finite()),
            Just(0.0),
            Just(-0.0),
        ]
    }

    fn design() -> impl Strategy<Value = Design> {
        (
            0..EXAMPLES.len(),
            proptest::collection::vec(finite(), kneepoint_engine::fields::FIELDS.len()),
            proptest::option::of(finite()),
            proptest::option::of((finite(), finite())),
            ".{0,20}",
        )
            .prop_map(|(i, vals, motor, hose, name)| {
                let mut d = (EXAMPLES[i].build)();
                for (s, v) in kneepoint_engine::fields::FIELDS.iter().zip(vals) {
                    kneepoint_engine::fields::set(&mut d, s.path, v);
                }
                d.drive.motor_rating_w = motor;
                d.lines.return_hose =
                    hose.map(|(bore_m, length_m)| Hose { bore_m, length_m });
                d.name = name;
                d
            })
    }

    proptest! {
        #[test]
        fn decode_never_panics(s in ".{0,300}") {
            let _ = decode(&s);
        }

        #[test]
        fn decode_never_panics_on_near_links(d in "[A-Za-z0-9_-]{0,200}", u in "(metric|us|x)") {
            let _ = decode(&format!("v=1&u={u}&base=baler&d={d}"));
        }

        #[test]
        fn encode_then_decode_is_identity(d in design(), us in any::<bool>()) {
            let units = if us { UnitSystem::Us } else { UnitSystem::Metric };
            let back = decode(&encode(&d, units, None));
            prop_assert_eq!(back, Ok(Shared { design: d, units, view: None }));
        }
    }
}
