//! App-wide reactive state: one signal per raw input, one memo that builds
//! the design, one that validates and evaluates it, and one that keeps the
//! last good report on screen while an input is invalid.
//!
//! Every view (the circuit view now; a duty-cycle and an at-the-machine
//! view later) reads the same [`AppState`] from context.

use kneepoint_engine::cycle::{evaluate_cycle, CycleError, CycleReport};
use kneepoint_engine::fields::{self, FIELDS};
use kneepoint_engine::{evaluate, Circuit, Design, Report, UnitSystem, ValidationErrors};
use leptos::prelude::*;

/// The views of the app, in the order of the view switcher.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ViewId {
    /// Pumps, valves, cylinder: staircase, power curve and results.
    Circuit,
    /// At the machine: readings, diagnosis, diagram, fault simulator.
    Field,
    /// The load profile over time: timeline, motor, heat, targets.
    Cycle,
}

impl ViewId {
    /// Every view, in switcher order.
    pub const ALL: &'static [ViewId] = &[ViewId::Circuit, ViewId::Cycle, ViewId::Field];
    /// Name in links (`view=`).
    pub fn code(self) -> &'static str {
        match self {
            ViewId::Circuit => "circuit",
            ViewId::Field => "field",
            ViewId::Cycle => "cycle",
        }
    }
    /// Label in the switcher.
    pub fn label(self) -> &'static str {
        match self {
            ViewId::Circuit => "Circuit",
            ViewId::Field => "Machine check",
            ViewId::Cycle => "Duty cycle",
        }
    }
    /// The view named `code` in a link.
    pub fn from_code(code: &str) -> Option<ViewId> {
        ViewId::ALL.iter().copied().find(|v| v.code() == code)
    }
}

/// How serious a notice is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum NoticeKind {
    /// Something happened as asked.
    Info,
    /// Something was refused or skipped; nothing is lost.
    Problem,
}

/// A message at the top of the page, until dismissed.
#[derive(Clone, Debug, PartialEq)]
pub struct Notice {
    /// Unique id (for dismissing).
    pub id: u64,
    /// How serious.
    pub kind: NoticeKind,
    /// The text.
    pub text: String,
}

/// The evaluation of the current design.
pub type Outcome = Result<Report, ValidationErrors>;

/// A valid design and its report, kept on screen while later edits are
/// invalid.
#[derive(Clone, Debug, PartialEq)]
pub struct Good {
    /// The design evaluated.
    pub design: Design,
    /// Its report.
    pub report: Report,
}

/// The duty-cycle evaluation of the last good design.
pub type CycleOutcome = Result<CycleReport, CycleError>;

/// The duty cycle of the last good design, for the duty-cycle view and its
/// parts (context). It is made by that view, so the cycle's code loads with
/// the view (see `crate::app`), and runs only while the view is open.
#[derive(Clone, Copy)]
pub struct CycleState {
    /// The duty cycle of the last good design (`None` before any).
    pub cycle: Memo<Option<CycleOutcome>>,
    /// The last cycle report that ran, kept while the cycle cannot run.
    pub cycle_shown: Memo<Option<CycleReport>>,
}

impl CycleState {
    /// The cycle memos of `st`'s last good circuit.
    pub fn new(st: &AppState) -> CycleState {
        let circuit = st.circuit;
        let cycle = Memo::new(move |_| circuit.with(|c| c.as_ref().map(evaluate_cycle)));
        let cycle_shown = Memo::new(
            move |prev: Option<&Option<CycleReport>>| match cycle.get() {
                Some(Ok(r)) => Some(r),
                _ => prev.cloned().flatten(),
            },
        );
        CycleState { cycle, cycle_shown }
    }
}

/// Signals and memos shared by every view (`Copy`, from context).
#[derive(Clone, Copy)]
pub struct AppState {
    /// Metric or US, for every field, chart and result.
    pub units: RwSignal<UnitSystem>,
    /// One signal per numeric input of [`FIELDS`], in SI, same order.
    pub values: &'static [RwSignal<f64>],
    /// Everything of the design that is not a numeric input (name, hoses,
    /// motor rating, duty cycle, faults); its numeric-input values are
    /// overwritten by [`AppState::values`].
    pub rest: RwSignal<Design>,
    /// Counts whole-design loads (preset, link, file): typed drafts from
    /// before a load are no longer shown.
    pub generation: RwSignal<u64>,
    /// The design now.
    pub design: Memo<Design>,
    /// Its evaluation.
    pub outcome: Memo<Outcome>,
    /// The last good design and report, kept while the design is invalid.
    pub shown: Memo<Option<Good>>,
    /// The validated circuit of the last good design, built once for every
    /// view that needs it (duty cycle, diagram, machine check).
    pub circuit: Memo<Option<Circuit>>,
    /// The open view.
    pub view: RwSignal<ViewId>,
    /// Messages at the top of the page.
    pub notices: RwSignal<Vec<Notice>>,
}

impl AppState {
    /// State holding `design` in `units`.
    pub fn new(design: Design, units: UnitSystem) -> AppState {
        let values: Vec<RwSignal<f64>> = FIELDS
            .iter()
            .map(|s| RwSignal::new(fields::get(&design, s.path).unwrap_or(s.default)))
            .collect();
        // The app state lives as long as the page: leaking the small slice
        // of signal handles keeps `AppState` `Copy`.
        let values: &'static [RwSignal<f64>] = Box::leak(values.into_boxed_slice());
        let rest = RwSignal::new(design);
        let design = Memo::new(move |_| {
            let mut d = rest.get();
            for (s, v) in FIELDS.iter().zip(values) {
                fields::set(&mut d, s.path, v.get());
            }
            d
        });
        let outcome = Memo::new(move |_| design.with(evaluate));
        let shown = Memo::new(move |prev: Option<&Option<Good>>| match outcome.get() {
            Ok(report) => Some(Good {
                design: design.get(),
                report,
            }),
            Err(_) => prev.cloned().flatten(),
        });
        let circuit = Memo::new(move |_| {
            shown.with(|g| g.as_ref().and_then(|g| Circuit::new(&g.design).ok()))
        });
        AppState {
            units: RwSignal::new(units),
            values,
            rest,
            generation: RwSignal::new(0),
            design,
            outcome,
            shown,
            circuit,
            view: RwSignal::new(ViewId::Circuit),
            notices: RwSignal::new(Vec::new()),
        }
    }

    /// Replaces the whole design (preset, link, file).
    pub fn load(&self, design: Design) {
        for (s, v) in FIELDS.iter().zip(self.values) {
            v.set(fields::get(&design, s.path).unwrap_or(s.default));
        }
        self.rest.set(design);
        self.generation.update(|g| *g += 1);
    }

    /// Shows a notice.
    pub fn notify(&self, kind: NoticeKind, text: impl Into<String>) {
        let text = text.into();
        self.notices.update(|n| {
            let id = n.iter().map(|x| x.id).max().unwrap_or(0) + 1;
            // The same text twice in a row is shown once.
            if !n.iter().any(|x| x.text == text) {
                n.push(Notice { id, kind, text });
            }
        });
    }

    /// The error message for the field at `path`, in the current units.
    pub fn field_error(&self, path: &'static str) -> Option<String> {
        let units = self.units.get();
        self.outcome.with(|o| match o {
            Err(e) => e.for_field(path).map(|e| e.message(units)),
            Ok(_) => None,
        })
    }
}
