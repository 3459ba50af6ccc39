//! The safety notes: short, always one press away, and on the printed sheet.

use leptos::prelude::*;

/// The cautions that go with any hi-lo circuit.
#[component]
pub fn SafetyNotes() -> impl IntoView {
    view! {
        <ul class="safety-list">
            <li>
                <strong>"Trapped pressure. "</strong>
                "The hi-lo check valve and a closed-centre directional valve can hold full system \
                 pressure after the motor stops. Raised platens and accumulators store energy too."
            </li>
            <li>
                <strong>"Before opening any fitting: "</strong>
                "lock out and tag out the power, lower or block the load, bleed the pressure down \
                 and verify zero on a gauge."
            </li>
            <li>
                <strong>"Injection injuries. "</strong>
                "A pinhole jet can pierce skin at about 7 bar (100 psi). Treat any injection as a \
                 surgical emergency and get medical help at once. Never feel for leaks with your \
                 hands: use cardboard or wood."
            </li>
            <li>
                <strong>"Ratings. "</strong>
                "Rate every component for at least the relief full-flow pressure, including \
                 intensification on the rod side (area ratio × pressure if the rod port is \
                 blocked) and pressure spikes. Protect the large pump in case the check valve \
                 sticks shut."
            </li>
            <li>
                <strong>"Standards. "</strong>
                "ISO 4413, local codes, the machine's instructions and licensed practice come \
                 first. These results are estimates for design and teaching; settings on a real \
                 machine are made by competent people with guarded access."
            </li>
        </ul>
    }
}

/// The safety panel, opened from the header.
#[component]
pub fn SafetyPanel(
    /// Whether the panel is open.
    open: RwSignal<bool>,
) -> impl IntoView {
    view! {
        <aside
            id="safety"
            class="panel safety"
            class:open=move || open.get()
            aria-labelledby="safety-h"
            data-testid="safety"
        >
            <div class="safety-head">
                <h2 id="safety-h">"Safety"</h2>
                <button type="button" class="close" on:click=move |_| open.set(false)>
                    "Close"
                </button>
            </div>
            <SafetyNotes />
        </aside>
    }
}
