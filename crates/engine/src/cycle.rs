//! Duty cycle over a load profile (to be built: see the duty-cycle issue).

use serde::{Deserialize, Serialize};

use crate::error::Checker;

/// The load profile and the thermal and motor data of a duty cycle.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(deny_unknown_fields)]
pub struct CycleSpec {}

pub(crate) fn validate(_c: &CycleSpec, _k: &mut Checker) {}
