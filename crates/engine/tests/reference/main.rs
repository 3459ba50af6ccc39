//! Reference tables: the engine against published factors, a registry
//! units library, and the worked examples of the domain brief. Each row
//! names its source; see `support` for the row format.

mod examples;
mod support;
mod units;
