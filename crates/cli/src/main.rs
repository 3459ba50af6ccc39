//! `kneepoint`: steady-state and duty-cycle reports of hi-lo circuit designs from the
//! command line, and the demo designs as files.
//!
//! ```text
//! kneepoint report FILE [--units metric|us] [--format text|json|csv] [--series]
//! kneepoint example [NAME]
//! ```
//! Exit status: 0 done; 1 the design is invalid (one line per field), or
//! its duty cycle cannot run when `--series` asks for it;
//! 2 usage error, unreadable or malformed file, unknown example.

mod output;

use std::io::Write;
use std::process::ExitCode;

use kneepoint_engine::cycle::evaluate_cycle;
use kneepoint_engine::io::{design_to_json, parse_design};
use kneepoint_engine::{evaluate, Circuit, UnitSystem, EXAMPLES};

const USAGE: &str = "\
Usage:
  kneepoint report FILE [--units metric|us] [--format text|json|csv] [--series]
      Operating points, corner powers, settings check, warnings and the
      duty cycle (per segment, totals, motor, heat, targets, warnings) of a
      design file. json is the engine's full report in SI units, the cycle
      under \"cycle\"; csv is the pressure-flow-power curves with units in
      the header, or with --series the cycle's time series.
  kneepoint example [NAME]
      Writes a demo design file to standard output; without NAME, lists them.
  kneepoint help

Exit status: 0 done, 1 invalid design, 2 usage or file error.";

/// Output format of `report`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Format {
    Text,
    Json,
    Csv,
}

/// A parsed command line.
#[derive(Debug, PartialEq)]
enum Command {
    Report {
        file: String,
        units: UnitSystem,
        format: Format,
        /// The cycle's time series instead of the curves (csv only).
        series: bool,
    },
    Example(Option<String>),
    Help,
}

/// A failure with its exit status and message for standard error.
struct Failure {
    code: u8,
    message: String,
}

fn usage_error(message: impl Into<String>) -> Failure {
    Failure {
        code: 2,
        message: format!("{}\n\n{USAGE}", message.into()),
    }
}

/// Reads `--name value` or `--name=value`.
fn option_value<'a>(
    arg: &'a str,
    name: &str,
    rest: &mut impl Iterator<Item = &'a String>,
) -> Result<Option<&'a str>, Failure> {
    if arg == name {
        return rest
            .next()
            .map(|v| Some(v.as_str()))
            .ok_or_else(|| usage_error(format!("{name} needs a value")));
    }
    Ok(arg
        .strip_prefix(name)
        .and_then(|tail| tail.strip_prefix('=')))
}

fn parse_args(args: &[String]) -> Result<Command, Failure> {
    let mut it = args.iter();
    let Some(cmd) = it.next() else {
        return Err(usage_error("No command given."));
    };
    match cmd.as_str() {
        "help" | "--help" | "-h" => Ok(Command::Help),
        "example" => {
            let name = it.next().cloned();
            if let Some(extra) = it.next() {
                return Err(usage_error(format!("Unexpected argument '{extra}'.")));
            }
            Ok(Command::Example(name))
        }
        "report" => {
            let mut file = None;
            let mut units = UnitSystem::Metric;
            let mut format = Format::Text;
            let mut series = false;
            while let Some(arg) = it.next() {
                if arg == "--series" {
                    series = true;
                    continue;
                }
                if let Some(v) = option_value(arg, "--units", &mut it)? {
                    units = UnitSystem::parse(v).ok_or_else(|| {
                        usage_error(format!("Unknown units '{v}': use metric or us."))
                    })?;
                } else if let Some(v) = option_value(arg, "--format", &mut it)? {
                    format = match v {
                        "text" => Format::Text,
                        "json" => Format::Json,
                        "csv" => Format::Csv,
                        _ => {
                            return Err(usage_error(format!(
                                "Unknown format '{v}': use text, json or csv."
                            )))
                        }
                    };
                } else if arg.starts_with("--") {
                    return Err(usage_error(format!("Unknown option '{arg}'.")));
                } else if file.is_none() {
                    file = Some(arg.clone());
                } else {
                    return Err(usage_error(format!("Unexpected argument '{arg}'.")));
                }
            }
            let file = file.ok_or_else(|| usage_error("report needs a design FILE."))?;
            if series && format != Format::Csv {
                return Err(usage_error("--series goes with --format csv."));
            }
            Ok(Command::Report {
                file,
                units,
                format,
                series,
            })
        }
        other => Err(usage_error(format!("Unknown command '{other}'."))),
    }
}

fn example_list() -> String {
    let width = EXAMPLES.iter().map(|e| e.name.len()).max().unwrap_or(0);
    EXAMPLES
        .iter()
        .map(|e| format!("  {:width$}  {}\n", e.name, e.title))
        .collect()
}

fn example(name: Option<&str>) -> Result<String, Failure> {
    match name {
        None => Ok(format!("Demo designs:\n{}", example_list())),
        Some(n) => match kneepoint_engine::example(n) {
            Some(d) => Ok(design_to_json(&d) + "\n"),
            None => Err(Failure {
                code: 2,
                message: format!(
                    "Unknown example '{n}'. Demo designs:\n{}",
                    example_list()
                ),
            }),
        },
    }
}

fn report(
    file: &str,
    units: UnitSystem,
    format: Format,
    series: bool,
) -> Result<String, Failure> {
    let text = std::fs::read_to_string(file).map_err(|e| Failure {
        code: 2,
        message: format!("{file}: cannot read: {e}"),
    })?;
    let design = parse_design(&text).map_err(|e| Failure {
        code: 2,
        message: format!("{file}: {e}"),
    })?;
    let report = evaluate(&design).map_err(|errors| Failure {
        code: 1,
        message: errors
            .0
            .iter()
            .map(|e| format!("{file}: {}: {}", e.path(), e.message(units)))
            .collect::<Vec<_>>()
            .join("\n"),
    })?;
    // `evaluate` succeeded, so the design is valid and the circuit builds.
    let cycle = Circuit::new(&design)
        .map_err(|e| Failure {
            code: 1,
            message: format!("{file}: {e}"),
        })
        .map(|c| evaluate_cycle(&c))?;
    Ok(match (format, series) {
        (Format::Text, _) => output::text(&design, &report, &cycle, units),
        (Format::Json, _) => output::json(&report, &cycle),
        (Format::Csv, false) => output::csv(&report, units),
        (Format::Csv, true) => match &cycle {
            Ok(c) => output::series_csv(c, units),
            Err(e) => {
                return Err(Failure {
                    code: 1,
                    message: format!(
                        "{file}: the duty cycle cannot run: {}",
                        e.message(units)
                    ),
                })
            }
        },
    })
}

fn run(args: &[String]) -> Result<String, Failure> {
    match parse_args(args)? {
        Command::Help => Ok(format!("{USAGE}\n")),
        Command::Example(name) => example(name.as_deref()),
        Command::Report {
            file,
            units,
            format,
            series,
        } => report(&file, units, format, series),
    }
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    match run(&args) {
        Ok(out) => {
            // A closed pipe (e.g. `| head`) is not an error worth a panic.
            let _ = std::io::stdout().write_all(out.as_bytes());
            ExitCode::SUCCESS
        }
        Err(f) => {
            eprintln!("{}", f.message);
            ExitCode::from(f.code)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn args(s: &str) -> Vec<String> {
        s.split_whitespace().map(String::from).collect()
    }

    #[test]
    fn parses_report_options_both_ways() {
        for line in [
            "report d.json --units us --format csv",
            "report --units=us --format=csv d.json",
        ] {
            assert_eq!(
                parse_args(&args(line)).ok(),
                Some(Command::Report {
                    file: "d.json".into(),
                    units: UnitSystem::Us,
                    format: Format::Csv,
                    series: false,
                }),
                "{line}"
            );
        }
    }

    #[test]
    fn usage_errors_exit_2() {
        for line in [
            "",
            "frobnicate",
            "report",
            "report a b",
            "report a --units furlongs",
            "report a --format xml",
            "report a --units",
            "report a --colour",
            "report a --series",
            "report a --series --format json",
            "example a b",
        ] {
            let e = parse_args(&args(line)).err().map(|f| f.code);
            assert_eq!(e, Some(2), "'{line}'");
        }
    }
}
