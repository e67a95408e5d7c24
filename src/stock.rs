//! Commercial thicknesses: the default plate lists, a table of pipe wall
//! thicknesses by nominal pipe size and schedule, and the search for the
//! thinnest candidate that covers a minimum thickness.
//!
//! The plate lists are common practice, no source. The pipe table is written
//! from memory of ASME B36.10M (welded and seamless wrought steel pipe);
//! verify it against the standard before ordering.

use crate::units::{Kind, Quantity, UnitSystem, INCH};
use serde::Serialize;

/// One commercial thickness with the words it is ordered by.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Candidate {
    /// Nominal (ordered) thickness.
    pub thickness: Quantity,
    /// How it is ordered (`12 mm plate`, `NPS 8 Sch 40`).
    pub label: String,
}

/// The default SI plate list, mm: the usual mill thicknesses to 50 mm, then
/// every 5 mm to 300 mm (common practice, no source).
pub fn si_plate_list() -> Vec<Quantity> {
    let mut mm: Vec<f64> = vec![
        3.0, 4.0, 5.0, 6.0, 8.0, 10.0, 12.0, 14.0, 15.0, 16.0, 18.0, 20.0, 22.0, 25.0, 28.0, 30.0, 32.0, 35.0, 38.0,
        40.0, 45.0, 50.0,
    ];
    mm.extend((11..=60).map(|i| f64::from(i) * 5.0));
    mm.into_iter().map(Quantity::mm).collect()
}

/// The default US plate list: 1/8 in to 1 in in 1/16 in steps, then 1/8 in
/// steps to 12 in (common practice, no source).
pub fn us_plate_list() -> Vec<Quantity> {
    let sixteenths = (2..=16).map(|i| f64::from(i) / 16.0);
    let eighths = (9..=96).map(|i| f64::from(i) / 8.0);
    sixteenths.chain(eighths).map(|inches| Quantity::new(inches * INCH, Kind::Length)).collect()
}

/// The default plate list for a report unit system.
pub fn default_plate_list(units: UnitSystem) -> Vec<Quantity> {
    match units {
        UnitSystem::Si => si_plate_list(),
        UnitSystem::Us => us_plate_list(),
    }
}

/// One nominal pipe size: outside diameter and wall thicknesses by schedule,
/// thinnest first (inches, from memory of ASME B36.10M).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct PipeSize {
    /// Nominal pipe size as written (`8`, `1-1/2`).
    pub nps: &'static str,
    /// Outside diameter, in.
    pub outside_diameter_in: f64,
    /// Schedule name and wall thickness in inches, thinnest first.
    pub walls: &'static [(&'static str, f64)],
}

impl PipeSize {
    /// The outside diameter.
    pub fn outside_diameter(&self) -> Quantity {
        Quantity::new(self.outside_diameter_in * INCH, Kind::Length)
    }

    /// Every schedule of the size as a candidate, thinnest first.
    pub fn candidates(&self) -> Vec<Candidate> {
        self.walls
            .iter()
            .map(|(sch, w)| Candidate {
                thickness: Quantity::new(w * INCH, Kind::Length),
                label: format!("NPS {} {sch}", self.nps),
            })
            .collect()
    }
}

/// Wall thicknesses of common pipe sizes, from memory of ASME B36.10M.
pub const PIPE_SIZES: &[PipeSize] = &[
    PipeSize {
        nps: "1/2",
        outside_diameter_in: 0.840,
        walls: &[("Sch 40", 0.109), ("Sch 80", 0.147), ("Sch 160", 0.188), ("XXS", 0.294)],
    },
    PipeSize {
        nps: "3/4",
        outside_diameter_in: 1.050,
        walls: &[("Sch 40", 0.113), ("Sch 80", 0.154), ("Sch 160", 0.219), ("XXS", 0.308)],
    },
    PipeSize {
        nps: "1",
        outside_diameter_in: 1.315,
        walls: &[("Sch 40", 0.133), ("Sch 80", 0.179), ("Sch 160", 0.250), ("XXS", 0.358)],
    },
    PipeSize {
        nps: "1-1/2",
        outside_diameter_in: 1.900,
        walls: &[("Sch 40", 0.145), ("Sch 80", 0.200), ("Sch 160", 0.281), ("XXS", 0.400)],
    },
    PipeSize {
        nps: "2",
        outside_diameter_in: 2.375,
        walls: &[("Sch 40", 0.154), ("Sch 80", 0.218), ("Sch 160", 0.344), ("XXS", 0.436)],
    },
    PipeSize {
        nps: "3",
        outside_diameter_in: 3.500,
        walls: &[("Sch 40", 0.216), ("Sch 80", 0.300), ("Sch 160", 0.438), ("XXS", 0.600)],
    },
    PipeSize {
        nps: "4",
        outside_diameter_in: 4.500,
        walls: &[("Sch 40", 0.237), ("Sch 80", 0.337), ("Sch 120", 0.438), ("Sch 160", 0.531), ("XXS", 0.674)],
    },
    PipeSize {
        nps: "6",
        outside_diameter_in: 6.625,
        walls: &[("Sch 40", 0.280), ("Sch 80", 0.432), ("Sch 120", 0.562), ("Sch 160", 0.719), ("XXS", 0.864)],
    },
    PipeSize {
        nps: "8",
        outside_diameter_in: 8.625,
        walls: &[
            ("Sch 20", 0.250),
            ("Sch 30", 0.277),
            ("Sch 40", 0.322),
            ("Sch 60", 0.406),
            ("Sch 80", 0.500),
            ("Sch 100", 0.594),
            ("Sch 120", 0.719),
            ("Sch 140", 0.812),
            ("Sch 160", 0.906),
        ],
    },
    PipeSize {
        nps: "10",
        outside_diameter_in: 10.750,
        walls: &[
            ("Sch 20", 0.250),
            ("Sch 30", 0.307),
            ("Sch 40", 0.365),
            ("Sch 60", 0.500),
            ("Sch 80", 0.594),
            ("Sch 100", 0.719),
            ("Sch 120", 0.844),
            ("Sch 140", 1.000),
            ("Sch 160", 1.125),
        ],
    },
    PipeSize {
        nps: "12",
        outside_diameter_in: 12.750,
        walls: &[
            ("Sch 20", 0.250),
            ("Sch 30", 0.330),
            ("STD", 0.375),
            ("Sch 40", 0.406),
            ("XS", 0.500),
            ("Sch 60", 0.562),
            ("Sch 80", 0.688),
            ("Sch 100", 0.844),
            ("Sch 120", 1.000),
            ("Sch 140", 1.125),
            ("Sch 160", 1.312),
        ],
    },
    PipeSize {
        nps: "14",
        outside_diameter_in: 14.000,
        walls: &[
            ("Sch 10", 0.250),
            ("Sch 20", 0.312),
            ("Sch 30", 0.375),
            ("Sch 40", 0.438),
            ("XS", 0.500),
            ("Sch 60", 0.594),
            ("Sch 80", 0.750),
        ],
    },
    PipeSize {
        nps: "16",
        outside_diameter_in: 16.000,
        walls: &[
            ("Sch 10", 0.250),
            ("Sch 20", 0.312),
            ("Sch 30", 0.375),
            ("Sch 40", 0.500),
            ("Sch 60", 0.656),
            ("Sch 80", 0.844),
        ],
    },
    PipeSize {
        nps: "18",
        outside_diameter_in: 18.000,
        walls: &[
            ("Sch 10", 0.250),
            ("Sch 20", 0.312),
            ("STD", 0.375),
            ("Sch 30", 0.438),
            ("XS", 0.500),
            ("Sch 40", 0.562),
            ("Sch 60", 0.750),
            ("Sch 80", 0.938),
        ],
    },
    PipeSize {
        nps: "20",
        outside_diameter_in: 20.000,
        walls: &[
            ("Sch 10", 0.250),
            ("Sch 20", 0.375),
            ("Sch 30", 0.500),
            ("Sch 40", 0.594),
            ("Sch 60", 0.812),
            ("Sch 80", 1.031),
        ],
    },
    PipeSize {
        nps: "24",
        outside_diameter_in: 24.000,
        walls: &[
            ("Sch 10", 0.250),
            ("Sch 20", 0.375),
            ("Sch 30", 0.562),
            ("Sch 40", 0.688),
            ("Sch 60", 0.969),
            ("Sch 80", 1.219),
        ],
    },
];

/// The pipe size whose outside diameter matches `od` within 0.5 mm (so that
/// the metric 168.3 mm finds NPS 6 at 6.625 in = 168.275 mm).
pub fn pipe_size_for(od: Quantity) -> Option<&'static PipeSize> {
    PIPE_SIZES.iter().find(|p| (p.outside_diameter().value - od.value).abs() <= 0.5e-3)
}

/// The outcome of a search through a list.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Search {
    /// Index of the thinnest candidate that covers the minimum, if any does.
    pub selected: Option<usize>,
    /// Index of the next thinner candidate (the one that fails), if any.
    pub thinner: Option<usize>,
}

/// The thinnest candidate whose delivered thickness (`thickness − deduction`)
/// covers `minimum`, with the same tolerance as the step engine's
/// "at least" checks so that a selection always passes its check.
/// Candidates are searched in order of thickness whatever their order in the list.
pub fn search(candidates: &[Candidate], minimum: f64, deduction: &dyn Fn(f64) -> f64) -> Search {
    let mut order: Vec<usize> = (0..candidates.len()).collect();
    order.sort_by(|a, b| candidates[*a].thickness.value.total_cmp(&candidates[*b].thickness.value));
    let covers = |t: f64| t - deduction(t) >= minimum * (1.0 - 1e-12) - 1e-15;
    let pos = order.iter().position(|i| covers(candidates[*i].thickness.value));
    Search {
        selected: pos.map(|p| order[p]),
        thinner: match pos {
            Some(p) if p > 0 => Some(order[p - 1]),
            Some(_) => None,
            None => order.last().copied(),
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn plates(mm: &[f64]) -> Vec<Candidate> {
        mm.iter().map(|t| Candidate { thickness: Quantity::mm(*t), label: format!("{t} mm") }).collect()
    }

    #[test]
    fn selects_just_under_at_and_just_over_a_list_value() {
        // Common practice, no source: the next list value at or above the minimum.
        let list = plates(&[8.0, 10.0, 12.0]);
        let none = |_: f64| 0.0;
        assert_eq!(search(&list, 9.999e-3, &none).selected, Some(1));
        assert_eq!(search(&list, 10.0e-3, &none).selected, Some(1));
        let over = search(&list, 10.001e-3, &none);
        assert_eq!(over.selected, Some(2));
        assert_eq!(over.thinner, Some(1));
        let too_thick = search(&list, 13e-3, &none);
        assert_eq!(too_thick.selected, None);
        assert_eq!(too_thick.thinner, Some(2));
    }

    #[test]
    fn pipe_under_tolerance_moves_the_selection_up() {
        // UG-16(d): 12.5 % under-tolerance. NPS 8 Sch 40 is 0.322 in, which
        // delivers 0.322 × 0.875 = 0.28175 in; a minimum of 0.29 in needs Sch 60
        // (0.406 × 0.875 = 0.35525 in). Walls from memory of ASME B36.10M.
        let nps8 = pipe_size_for(Quantity::new(8.625 * INCH, Kind::Length)).unwrap();
        let c = nps8.candidates();
        let pipe = |t: f64| 0.125 * t;
        let s = search(&c, 0.28 * INCH, &pipe);
        assert_eq!(c[s.selected.unwrap()].label, "NPS 8 Sch 40");
        let s = search(&c, 0.29 * INCH, &pipe);
        assert_eq!(c[s.selected.unwrap()].label, "NPS 8 Sch 60");
        assert_eq!(c[s.thinner.unwrap()].label, "NPS 8 Sch 40");
    }

    #[test]
    fn metric_outside_diameter_finds_its_pipe_size() {
        assert_eq!(pipe_size_for(Quantity::mm(168.3)).map(|p| p.nps), Some("6"));
        assert_eq!(pipe_size_for(Quantity::mm(170.0)), None);
    }

    #[test]
    fn default_lists_are_increasing_and_reach_the_stated_values() {
        for list in [si_plate_list(), us_plate_list()] {
            assert!(list.windows(2).all(|w| w[0].value < w[1].value));
        }
        let si = si_plate_list();
        assert!(si.iter().any(|q| (q.value - 0.055).abs() < 1e-12));
        let us = us_plate_list();
        assert!((us[0].value - INCH / 8.0).abs() < 1e-12);
        // After 1 in, steps of 1/8 in.
        let i = us.iter().position(|q| (q.value - INCH).abs() < 1e-12).unwrap();
        assert!((us[i + 1].value - 1.125 * INCH).abs() < 1e-12);
        for p in PIPE_SIZES {
            assert!(p.walls.windows(2).all(|w| w[0].1 < w[1].1), "NPS {}", p.nps);
        }
    }
}
