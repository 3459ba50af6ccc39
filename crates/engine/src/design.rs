//! The design: everything a user enters about one hi-lo circuit.
//!
//! A [`Design`] is plain data with public fields, in coherent SI, and it is
//! the versioned JSON design file (see `docs/design-format.md`). Field names
//! carry their unit (`_pa`, `_m3s`, `_m`, `_n`, `_w`) so that a file read
//! without the docs is still unambiguous. A `Design` may hold any values;
//! [`crate::Circuit::new`] validates it.

use serde::{Deserialize, Serialize};

use crate::cycle::{
    CycleSpec, ForcePoint, Hold, PressingForce, Requirements, Reservoir, Segment,
};
use crate::faults::Faults;
use crate::units::{BAR, LITRE, MINUTE};

/// Version of the design file format written by this engine.
pub const DESIGN_FORMAT: u32 = 1;

/// One hi-lo circuit: drive, two pumps, valves, lines, cylinder and loads.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Design {
    /// File format version; only [`DESIGN_FORMAT`] is read.
    pub format: u32,
    /// A short name the user gives the design.
    #[serde(default)]
    pub name: String,
    /// Electric motor and shaft.
    pub drive: Drive,
    /// The large, low-pressure pump (L).
    pub large_pump: Pump,
    /// The small, high-pressure pump (S).
    pub small_pump: Pump,
    /// Check valve between L and the system line.
    pub check_valve: CheckValve,
    /// Unloading valve on the L outlet, piloted from system pressure.
    pub unloading_valve: UnloadingValve,
    /// Relief valve on the system line.
    pub relief_valve: ReliefValve,
    /// Directional control valve, one rated drop per flow path.
    pub directional_valve: DirectionalValve,
    /// Lumped line losses, and optional hoses for a Darcy–Weisbach check.
    pub lines: Lines,
    /// Hydraulic oil.
    pub oil: Oil,
    /// Double-acting cylinder.
    pub cylinder: Cylinder,
    /// Load force in each motion.
    pub loads: Loads,
    /// Pressure ratings of the components.
    pub ratings: Ratings,
    /// Margins used to check the settings.
    #[serde(default)]
    pub rules: Rules,
    /// Duty cycle (load profile, reservoir, motor choice).
    #[serde(default)]
    pub cycle: CycleSpec,
    /// Faults injected for teaching and for diagnosis tests.
    #[serde(default)]
    pub faults: Faults,
}

/// Electric motor and shaft.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Drive {
    /// Loaded shaft speed (rpm), e.g. 1450 at 50 Hz, 1750 at 60 Hz.
    pub speed_rpm: f64,
    /// Installed motor rating (W); `None` lets the tool recommend one.
    #[serde(default)]
    pub motor_rating_w: Option<f64>,
    /// Motor efficiency (0, 1], for electrical input power.
    pub motor_efficiency: f64,
}

/// A fixed-displacement pump section.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pump {
    /// Geometric displacement (m³/rev).
    pub displacement_m3: f64,
    /// Volumetric efficiency (0, 1] at `rated_pressure_pa` and the drive speed.
    pub volumetric_efficiency: f64,
    /// Pressure at which `volumetric_efficiency` holds (Pa).
    pub rated_pressure_pa: f64,
    /// Hydro-mechanical efficiency (0, 1].
    pub hydromechanical_efficiency: f64,
    /// Drag torque at zero pressure (N·m), 0 when unknown.
    #[serde(default)]
    pub no_load_torque_nm: f64,
}

/// Check valve from L into the system line.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CheckValve {
    /// Cracking pressure (Pa).
    pub cracking_pa: f64,
    /// Pressure drop above cracking at `rated_flow_m3s` (Pa).
    pub rated_drop_pa: f64,
    /// Flow of the rated point (m³/s).
    pub rated_flow_m3s: f64,
}

/// Unloading valve on the L outlet, externally piloted from system pressure.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UnloadingValve {
    /// Pilot (system) pressure at which it starts to open (Pa).
    pub setting_pa: f64,
    /// Pilot-pressure band from starting to open to fully open, as a
    /// fraction of the setting (0.01–0.15 typical).
    pub band_fraction: f64,
    /// Reseat hysteresis as a fraction of the setting (0–0.30).
    pub reseat_fraction: f64,
    /// Back-pressure of the unloaded pump, valve plus tank line (Pa), at
    /// `back_pressure_flow_m3s`; it scales with the square of flow.
    pub back_pressure_pa: f64,
    /// Flow of the back-pressure point (m³/s).
    pub back_pressure_flow_m3s: f64,
}

/// Relief valve on the system line. "Setting" on a nameplate usually means
/// the full-flow pressure; both are entered here.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ReliefValve {
    /// Cracking pressure: first measurable flow (Pa).
    pub cracking_pa: f64,
    /// Full-flow pressure: passes all pump flow (Pa).
    pub full_flow_pa: f64,
}

/// Directional control valve: rated drop per path at one rated flow.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DirectionalValve {
    /// Flow of the rated points (m³/s).
    pub rated_flow_m3s: f64,
    /// Drop P→A at rated flow (Pa).
    pub drop_p_a_pa: f64,
    /// Drop B→T at rated flow (Pa).
    pub drop_b_t_pa: f64,
    /// Drop P→B at rated flow (Pa).
    pub drop_p_b_pa: f64,
    /// Drop A→T at rated flow (Pa).
    pub drop_a_t_pa: f64,
}

/// Line losses outside the valves.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Lines {
    /// Lumped drop of the pressure line (pump to valve to cylinder) at
    /// `rated_flow_m3s` (Pa).
    pub pressure_drop_pa: f64,
    /// Lumped drop of the return line (cylinder to valve to tank) at
    /// `rated_flow_m3s` (Pa).
    pub return_drop_pa: f64,
    /// Flow of the lumped rated points (m³/s).
    pub rated_flow_m3s: f64,
    /// Optional pressure hose, added to the lumped drop (Darcy–Weisbach).
    #[serde(default)]
    pub pressure_hose: Option<Hose>,
    /// Optional return hose, added to the lumped drop (Darcy–Weisbach).
    #[serde(default)]
    pub return_hose: Option<Hose>,
}

/// A straight hose or tube.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Hose {
    /// Inside diameter (m).
    pub bore_m: f64,
    /// Length (m).
    pub length_m: f64,
}

/// Hydraulic oil properties at working temperature.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Oil {
    /// Density (kg/m³), 870 typical for mineral oil.
    pub density_kg_m3: f64,
    /// Kinematic viscosity (m²/s); 46 cSt = 46e-6 m²/s.
    pub viscosity_m2s: f64,
    /// Effective bulk modulus of oil, hoses and trapped air (Pa).
    pub bulk_modulus_pa: f64,
}

/// Double-acting single-rod cylinder.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Cylinder {
    /// Piston (bore) diameter (m).
    pub bore_m: f64,
    /// Rod diameter (m), smaller than the bore.
    pub rod_m: f64,
    /// Full stroke (m).
    pub stroke_m: f64,
}

/// Load forces opposing each motion (N, zero or more).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Loads {
    /// Force during the rapid approach (friction, tooling weight).
    pub approach_force_n: f64,
    /// Force at the end of pressing.
    pub pressing_force_n: f64,
    /// Force during the rapid retract.
    pub retract_force_n: f64,
}

/// Component ratings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Ratings {
    /// Lowest rated pressure of the small pump, valve, cylinder and hoses (Pa).
    pub component_pa: f64,
    /// Setting of a relief valve protecting the large pump if the check valve
    /// sticks shut (Pa); `None` when there is none.
    #[serde(default)]
    pub large_pump_relief_pa: Option<f64>,
}

/// Margins for the settings check (brief §3.3, common practice).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Rules {
    /// Unloading setting at least this factor times the fast-motion pressure.
    pub unload_margin_factor: f64,
    /// ... and at least this much above it (Pa).
    pub unload_margin_min_pa: f64,
    /// Relief cracking at least this factor times the pressing pressure.
    pub relief_margin_factor: f64,
    /// ... and at least this much above it (Pa).
    pub relief_margin_min_pa: f64,
}

impl Default for Rules {
    fn default() -> Self {
        Rules {
            unload_margin_factor: 1.25,
            unload_margin_min_pa: 7.0 * BAR,
            relief_margin_factor: 1.10,
            relief_margin_min_pa: 10.0 * BAR,
        }
    }
}

const LPM: f64 = LITRE / MINUTE;

/// A demo design: one of our own scenarios, never a real machine.
#[derive(Clone, Copy, Debug)]
pub struct Example {
    /// Machine-readable name (`kneepoint example NAME`).
    pub name: &'static str,
    /// One line for people.
    pub title: &'static str,
    /// Builds the design.
    pub build: fn() -> Design,
}

/// The built-in demo designs, the first is the default.
pub const EXAMPLES: &[Example] = &[
    Example {
        name: "workshop-press",
        title: "Workshop press, 100 mm bore, 30 L/min approach at 1450 rpm",
        build: workshop_press,
    },
    Example {
        name: "baler",
        title: "Cardboard baler, 125 mm bore, long approach, 80 + 8 cm³/rev",
        build: baler,
    },
    Example {
        name: "clamp",
        title: "Clamping fixture, 63 mm bore, short stroke, 1750 rpm",
        build: clamp,
    },
];

/// Looks up a demo design by name.
pub fn example(name: &str) -> Option<Design> {
    EXAMPLES
        .iter()
        .find(|e| e.name == name)
        .map(|e| (e.build)())
}

fn pump(displacement_cm3: f64, vol_eff: f64, rated_bar: f64, hm: f64) -> Pump {
    Pump {
        displacement_m3: displacement_cm3 * 1e-6,
        volumetric_efficiency: vol_eff,
        rated_pressure_pa: rated_bar * BAR,
        hydromechanical_efficiency: hm,
        no_load_torque_nm: 0.0,
    }
}

/// Workshop press: 16 + 4 cm³/rev at 1450 rpm, 100/56 mm cylinder, 100 kN.
pub fn workshop_press() -> Design {
    Design {
        format: DESIGN_FORMAT,
        name: "Workshop press".into(),
        drive: Drive {
            speed_rpm: 1450.0,
            motor_rating_w: None,
            motor_efficiency: 0.89,
        },
        large_pump: pump(16.0, 0.92, 50.0, 0.88),
        small_pump: pump(4.0, 0.92, 200.0, 0.88),
        check_valve: CheckValve {
            cracking_pa: 0.5 * BAR,
            rated_drop_pa: 1.5 * BAR,
            rated_flow_m3s: 40.0 * LPM,
        },
        unloading_valve: UnloadingValve {
            setting_pa: 30.0 * BAR,
            band_fraction: 0.05,
            reseat_fraction: 0.03,
            back_pressure_pa: 4.0 * BAR,
            back_pressure_flow_m3s: 23.0 * LPM,
        },
        relief_valve: ReliefValve {
            cracking_pa: 160.0 * BAR,
            full_flow_pa: 168.0 * BAR,
        },
        directional_valve: DirectionalValve {
            rated_flow_m3s: 60.0 * LPM,
            drop_p_a_pa: 5.0 * BAR,
            drop_b_t_pa: 5.0 * BAR,
            drop_p_b_pa: 5.0 * BAR,
            drop_a_t_pa: 5.0 * BAR,
        },
        lines: Lines {
            pressure_drop_pa: 1.0 * BAR,
            return_drop_pa: 1.0 * BAR,
            rated_flow_m3s: 30.0 * LPM,
            pressure_hose: Some(Hose {
                bore_m: 0.0127,
                length_m: 2.0,
            }),
            return_hose: Some(Hose {
                bore_m: 0.019,
                length_m: 2.0,
            }),
        },
        oil: oil_vg46(),
        cylinder: Cylinder {
            bore_m: 0.100,
            rod_m: 0.056,
            stroke_m: 0.400,
        },
        loads: Loads {
            approach_force_n: 1500.0,
            pressing_force_n: 100.0e3,
            retract_force_n: 1000.0,
        },
        ratings: Ratings {
            component_pa: 250.0 * BAR,
            large_pump_relief_pa: None,
        },
        rules: Rules::default(),
        cycle: workshop_cycle(),
        faults: Faults::default(),
    }
}

/// Cardboard baler: 80 + 8 cm³/rev, 125/70 mm cylinder, long stroke.
pub fn baler() -> Design {
    let mut d = workshop_press();
    d.name = "Cardboard baler".into();
    d.large_pump = pump(80.0, 0.93, 40.0, 0.88);
    d.small_pump = pump(8.0, 0.93, 180.0, 0.88);
    d.check_valve.rated_flow_m3s = 120.0 * LPM;
    d.unloading_valve.setting_pa = 35.0 * BAR;
    d.unloading_valve.back_pressure_flow_m3s = 116.0 * LPM;
    d.relief_valve = ReliefValve {
        cracking_pa: 170.0 * BAR,
        full_flow_pa: 180.0 * BAR,
    };
    d.directional_valve.rated_flow_m3s = 150.0 * LPM;
    d.lines.rated_flow_m3s = 130.0 * LPM;
    d.lines.pressure_hose = Some(Hose {
        bore_m: 0.025,
        length_m: 3.0,
    });
    d.lines.return_hose = Some(Hose {
        bore_m: 0.032,
        length_m: 3.0,
    });
    d.cylinder = Cylinder {
        bore_m: 0.125,
        rod_m: 0.070,
        stroke_m: 1.200,
    };
    d.loads = Loads {
        approach_force_n: 3000.0,
        pressing_force_n: 190.0e3,
        retract_force_n: 2000.0,
    };
    d.ratings = Ratings {
        component_pa: 250.0 * BAR,
        large_pump_relief_pa: Some(60.0 * BAR),
    };
    d.cycle = baler_cycle();
    d
}

/// Clamping fixture: 10 + 2 cm³/rev at 1750 rpm, 63/36 mm cylinder.
pub fn clamp() -> Design {
    let mut d = workshop_press();
    d.name = "Clamping fixture".into();
    d.drive.speed_rpm = 1750.0;
    d.large_pump = pump(10.0, 0.90, 40.0, 0.85);
    d.small_pump = pump(2.0, 0.90, 120.0, 0.85);
    d.check_valve.rated_flow_m3s = 20.0 * LPM;
    d.unloading_valve.setting_pa = 25.0 * BAR;
    d.unloading_valve.back_pressure_pa = 3.0 * BAR;
    d.unloading_valve.back_pressure_flow_m3s = 17.5 * LPM;
    d.relief_valve = ReliefValve {
        cracking_pa: 110.0 * BAR,
        full_flow_pa: 120.0 * BAR,
    };
    d.directional_valve.rated_flow_m3s = 30.0 * LPM;
    d.lines.rated_flow_m3s = 20.0 * LPM;
    d.lines.pressure_hose = None;
    d.lines.return_hose = None;
    d.cylinder = Cylinder {
        bore_m: 0.063,
        rod_m: 0.036,
        stroke_m: 0.080,
    };
    d.loads = Loads {
        approach_force_n: 300.0,
        pressing_force_n: 30.0e3,
        retract_force_n: 300.0,
    };
    d.ratings = Ratings {
        component_pa: 160.0 * BAR,
        large_pump_relief_pa: Some(50.0 * BAR),
    };
    d.cycle = clamp_cycle();
    d
}

const MM: f64 = 1e-3;
const KN: f64 = 1e3;

/// Workshop press cycle: approach 360 mm, press 40 mm against a part that
/// stiffens from 20 to 100 kN, hold 1.5 s at relief, decompress, retract.
fn workshop_cycle() -> CycleSpec {
    CycleSpec {
        segments: vec![
            Segment::Approach {
                distance_m: 360.0 * MM,
                force_n: 1.5 * KN,
            },
            Segment::Pressing {
                distance_m: 40.0 * MM,
                force: PressingForce::Linear {
                    from_n: 20.0 * KN,
                    to_n: 100.0 * KN,
                },
            },
            Segment::Dwell {
                time_s: 1.5,
                hold: Hold::AtRelief,
            },
            Segment::Decompression { time_s: 0.5 },
            Segment::Retract {
                distance_m: 400.0 * MM,
                force_n: 1.0 * KN,
            },
            Segment::Idle { time_s: 4.0 },
        ],
        dead_volume_m3: 0.8 * LITRE,
        reservoir: Reservoir {
            oil_volume_m3: Some(80.0 * LITRE),
            wetted_area_m2: Some(1.6),
            ..Reservoir::default()
        },
        requirements: Requirements {
            approach_speed_ms: Some(50.0 * MM),
            pressing_speed_ms: Some(8.0 * MM),
            cycle_time_s: Some(22.0),
        },
        ..CycleSpec::default()
    }
}

/// Baler cycle: long approach, compaction force rising steeply over the last
/// 200 mm (a table), bale held with the pumps unloaded, decompress, retract.
fn baler_cycle() -> CycleSpec {
    let pt = |mm: f64, kn: f64| ForcePoint {
        position_m: mm * MM,
        force_n: kn * KN,
    };
    CycleSpec {
        segments: vec![
            Segment::Approach {
                distance_m: 1000.0 * MM,
                force_n: 3.0 * KN,
            },
            Segment::Pressing {
                distance_m: 200.0 * MM,
                force: PressingForce::Table {
                    points: vec![
                        pt(0.0, 5.0),
                        pt(80.0, 20.0),
                        pt(150.0, 80.0),
                        pt(200.0, 190.0),
                    ],
                },
            },
            Segment::Dwell {
                time_s: 3.0,
                hold: Hold::Unloaded,
            },
            Segment::Decompression { time_s: 1.0 },
            Segment::Retract {
                distance_m: 1200.0 * MM,
                force_n: 2.0 * KN,
            },
            Segment::Idle { time_s: 8.0 },
        ],
        dead_volume_m3: 1.5 * LITRE,
        reservoir: Reservoir {
            oil_volume_m3: Some(250.0 * LITRE),
            wetted_area_m2: Some(2.6),
            ..Reservoir::default()
        },
        requirements: Requirements {
            approach_speed_ms: Some(150.0 * MM),
            pressing_speed_ms: Some(15.0 * MM),
            cycle_time_s: Some(40.0),
        },
        ..CycleSpec::default()
    }
}

/// Clamp cycle: close 70 mm, clamp over 10 mm from 2 to 30 kN, hold 10 s
/// with the pumps unloaded (pilot-operated check), release, open.
fn clamp_cycle() -> CycleSpec {
    CycleSpec {
        segments: vec![
            Segment::Approach {
                distance_m: 70.0 * MM,
                force_n: 0.3 * KN,
            },
            Segment::Pressing {
                distance_m: 10.0 * MM,
                force: PressingForce::Linear {
                    from_n: 2.0 * KN,
                    to_n: 30.0 * KN,
                },
            },
            Segment::Dwell {
                time_s: 10.0,
                hold: Hold::Unloaded,
            },
            Segment::Decompression { time_s: 0.3 },
            Segment::Retract {
                distance_m: 80.0 * MM,
                force_n: 0.3 * KN,
            },
            Segment::Idle { time_s: 3.0 },
        ],
        dead_volume_m3: 0.3 * LITRE,
        reservoir: Reservoir {
            oil_volume_m3: Some(30.0 * LITRE),
            wetted_area_m2: Some(0.7),
            ..Reservoir::default()
        },
        requirements: Requirements {
            approach_speed_ms: None,
            pressing_speed_ms: None,
            cycle_time_s: Some(16.0),
        },
        ..CycleSpec::default()
    }
}

/// ISO VG 46 mineral oil near 40 °C: 46 cSt, 870 kg/m³, β_e 1.0 GPa
/// (brief §4 oil data and §5.3 defaults; from memory of ISO 3448).
pub fn oil_vg46() -> Oil {
    Oil {
        density_kg_m3: 870.0,
        viscosity_m2s: 46.0e-6,
        bulk_modulus_pa: 1.0e9,
    }
}

impl Default for Design {
    /// The first demo design.
    fn default() -> Self {
        workshop_press()
    }
}
