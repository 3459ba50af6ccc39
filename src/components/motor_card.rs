//! The motor card: rating series and choice, how hard the cycle loads the
//! motor at its peak and on RMS, and the electrical input (brief §6).

use kneepoint_engine::motor::{ratings, MotorSeries};
use kneepoint_engine::units::format;
use kneepoint_engine::{Quantity, UnitSystem};
use leptos::prelude::*;

use crate::components::cycle_input::CycleNumber;
use crate::state::{AppState, CycleState};

/// Percent text of a fraction: 0.734 → "73 %".
pub fn percent(f: f64) -> String {
    format!("{:.0} %", 100.0 * f)
}

/// A rating's nameplate label, with the value in the other unit system
/// when the series and the chosen units differ ("7.5 kW (10.06 hp)").
pub fn rating_text(series: MotorSeries, label: &str, w: f64, u: UnitSystem) -> String {
    let same = matches!(
        (series, u),
        (MotorSeries::Iec, UnitSystem::Metric) | (MotorSeries::Nema, UnitSystem::Us)
    );
    if same {
        label.to_string()
    } else {
        format!("{label} ({})", format(Quantity::Power, u, w))
    }
}

/// The label of the rating `w` in `series`, or a custom label.
fn label_of(series: MotorSeries, w: f64) -> Option<String> {
    ratings(series)
        .into_iter()
        .find(|r| (r.rating_w - w).abs() <= 1e-9 * w)
        .map(|r| r.label)
}

/// One row of a card: a name, a value, a note.
pub fn card_row(
    name: &'static str,
    value: String,
    note: Option<String>,
    testid: &'static str,
) -> impl IntoView {
    view! {
        <div class="result" data-testid=testid>
            <dt>{name}</dt>
            <dd>
                <span class="value">{value}</span>
                {note.map(|n| view! { <span class="detail">{n}</span> })}
            </dd>
        </div>
    }
}

/// Series toggle and rating choice.
fn motor_inputs(st: AppState) -> impl IntoView {
    let series = move || st.rest.with(|d| d.cycle.motor.series);
    let set_series = move |s: MotorSeries| {
        st.rest.update(|d| {
            if d.cycle.motor.series != s {
                d.cycle.motor.series = s;
                // A choice from the other series would not be on this list.
                d.cycle.motor.chosen_rating_w = None;
            }
        })
    };
    let series_button =
        move |s: MotorSeries, text: &'static str, testid: &'static str| {
            view! {
                <button
                    type="button"
                    aria-pressed=move || (series() == s).to_string()
                    data-testid=testid
                    on:click=move |_| set_series(s)
                >
                    {text}
                </button>
            }
        };
    let options = move || {
        let u = st.units.get();
        let (s, chosen, installed) = st.rest.with(|d| {
            (
                d.cycle.motor.series,
                d.cycle.motor.chosen_rating_w,
                d.drive.motor_rating_w,
            )
        });
        let auto = match installed {
            Some(w) => format!(
                "Installed rating from the Circuit view ({})",
                format(Quantity::Power, u, w)
            ),
            None => "Smallest that passes both checks".to_string(),
        };
        let mut v = vec![view! {
            <option value="auto" selected=chosen.is_none()>
                {auto}
            </option>
        }
        .into_any()];
        if let Some(w) = chosen.filter(|w| label_of(s, *w).is_none()) {
            v.push(
                view! {
                    <option value=w.to_string() selected=true>
                        {format!("Custom {}", format(Quantity::Power, u, w))}
                    </option>
                }
                .into_any(),
            );
        }
        v.extend(ratings(s).into_iter().map(|r| {
            let sel = chosen.is_some_and(|w| (w - r.rating_w).abs() <= 1e-9 * w);
            view! {
                <option value=r.rating_w.to_string() selected=sel>
                    {rating_text(s, &r.label, r.rating_w, u)}
                </option>
            }
            .into_any()
        }));
        v
    };
    let choose = move |ev| {
        let v = event_target_value(&ev);
        let w = v.parse::<f64>().ok().filter(|w| w.is_finite() && *w > 0.0);
        st.rest.update(|d| d.cycle.motor.chosen_rating_w = w);
    };
    let margin =
        Signal::derive(move || Some(st.rest.with(|d| d.cycle.motor.margin_fraction)));
    let set_margin = Callback::new(move |v: Option<f64>| {
        if let Some(v) = v {
            st.rest.update(|d| d.cycle.motor.margin_fraction = v);
        }
    });
    let k = Signal::derive(move || Some(st.rest.with(|d| d.cycle.motor.peak_allowance)));
    let set_k = Callback::new(move |v: Option<f64>| {
        if let Some(v) = v {
            st.rest.update(|d| d.cycle.motor.peak_allowance = v);
        }
    });
    view! {
        <div class="field">
            <span class="field-label" id="c-series-label">
                "Rating series"
            </span>
            <div class="toggle" role="group" aria-labelledby="c-series-label">
                {series_button(MotorSeries::Iec, "IEC kW", "series-iec")}
                {series_button(MotorSeries::Nema, "NEMA hp", "series-nema")}
            </div>
        </div>
        <div class="field">
            <label class="field-label" for="c-motor-choice">
                "Motor to check"
            </label>
            <select id="c-motor-choice" class="select" on:change=choose data-testid="motor-choice">
                {options}
            </select>
        </div>
        <details class="advanced">
            <summary>"Sizing rules (2)"</summary>
            <CycleNumber
                label="Margin over RMS power"
                quantity=Quantity::Percent
                path="cycle.motor.margin_fraction"
                value=margin
                on_set=set_margin
            />
            <CycleNumber
                label="Peak allowed, times the rating"
                quantity=Quantity::Ratio
                path="cycle.motor.peak_allowance"
                value=k
                on_set=set_k
            />
        </details>
    }
}

/// The motor card.
#[component]
pub fn MotorCard() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    let body = move || {
        let u = st.units.get();
        cy.cycle_shown.with(|r| {
            let r = r.as_ref()?;
            let m = &r.motor;
            let t = &r.totals;
            let pw = |w: f64| format(Quantity::Power, u, w);
            let fit = match &m.recommended {
                Some(rec) => rating_text(m.series, &rec.label, rec.rating_w, u),
                None => "none in this series".into(),
            };
            let checked = m.checked_rating_w.map(|w| {
                let label = label_of(m.series, w).map_or_else(
                    || pw(w),
                    |l| rating_text(m.series, &l, w, u),
                );
                let why = if m.checked_is_chosen {
                    "your choice"
                } else {
                    "smallest that passes"
                };
                format!("{label}, {why}")
            });
            let peak_ok = m.peak_loading.map(|l| l <= m.peak_allowance * (1.0 + 1e-9));
            let rms_ok = m
                .rms_loading
                .map(|l| l * (1.0 + m.margin_fraction) <= 1.0 + 1e-9);
            let verdict = |ok: Option<bool>| match ok {
                Some(true) => "within",
                Some(false) => "over",
                None => "",
            };
            Some(view! {
                <dl
                    class="results"
                    data-peak-w=t.peak_power_w.to_string()
                    data-rms-w=t.rms_power_w.to_string()
                    data-rating-w=m.checked_rating_w.map(|w| w.to_string()).unwrap_or_default()
                    data-testid="motor-figures"
                >
                    {card_row(
                        "Smallest motor that passes",
                        fit,
                        Some(format!(
                            "Needs at least {}: RMS × (1 + {}) and peak ÷ {:.2}",
                            pw(m.minimum_w),
                            percent(m.margin_fraction),
                            m.peak_allowance
                        )),
                        "motor-fit",
                    )}
                    {checked.map(|c| card_row("Motor checked", c, None, "motor-checked"))}
                    {m.peak_loading.map(|l| {
                        card_row(
                            "Loading at peak",
                            format!("{} of rating", percent(l)),
                            Some(format!(
                                "Peak shaft power {}; {} the {} allowance",
                                pw(t.peak_power_w),
                                verdict(peak_ok),
                                percent(m.peak_allowance)
                            )),
                            "motor-peak",
                        )
                    })}
                    {m.rms_loading.map(|l| {
                        card_row(
                            "Loading on RMS (heating)",
                            format!("{} of rating", percent(l)),
                            Some(format!(
                                "RMS shaft power {}; {} the {} margin",
                                pw(t.rms_power_w),
                                verdict(rms_ok),
                                percent(m.margin_fraction)
                            )),
                            "motor-rms",
                        )
                    })}
                    {card_row(
                        "Electrical input",
                        format!("{} mean, {} peak", pw(m.electrical_mean_w), pw(m.electrical_peak_w)),
                        Some(format!(
                            "At {} motor efficiency; {} per cycle",
                            percent(m.motor_efficiency),
                            format(Quantity::Energy, u, t.electrical_energy_j)
                        )),
                        "motor-electric",
                    )}
                    {card_row(
                        "Peak shaft torque",
                        format(Quantity::Torque, u, t.peak_torque_nm),
                        Some(format!("Mean shaft power {}", pw(t.mean_power_w))),
                        "motor-torque",
                    )}
                </dl>
            })
        })
    };
    view! {
        <section class="panel card motor-card" aria-labelledby="motor-h" data-testid="motor-card">
            <h2 id="motor-h">"Motor"</h2>
            {motor_inputs(st)}
            {body}
            <p class="quiet small-print">
                "RMS sizing holds for cycles under about 5 minutes with the motor running \
                 throughout; a motor that stops between cycles cools less."
            </p>
        </section>
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rating_text_adds_the_other_unit() {
        assert_eq!(
            rating_text(MotorSeries::Iec, "7.5 kW", 7500.0, UnitSystem::Metric),
            "7.5 kW"
        );
        // 7.5 kW = 10.06 hp (1 hp = 745.7 W, NIST SP 811 B.8).
        assert_eq!(
            rating_text(MotorSeries::Iec, "7.5 kW", 7500.0, UnitSystem::Us),
            "7.5 kW (10.06 hp)"
        );
        assert_eq!(percent(0.734), "73 %");
        assert_eq!(
            label_of(MotorSeries::Iec, 5500.0).as_deref(),
            Some("5.5 kW")
        );
        assert_eq!(label_of(MotorSeries::Iec, 9200.0), None);
    }
}
