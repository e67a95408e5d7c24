//! Joint efficiency from the joint's construction: the look-up of Table
//! UW-12 by joint type and extent of radiography, and UW-12(d) for seamless
//! shells and heads.
//!
//! The table below is written from memory of ASME BPVC Section VIII
//! Division 1, Table UW-12 (joint types 1 to 6, columns (a) full, (b) spot
//! and (c) no radiographic examination per UW-11); verify it against the
//! edition in force. Cells the table marks not applicable are refused as
//! input errors. The limitations the table states for each joint type
//! (thickness, diameter, which joints a type may be used for) are reported as
//! limits of the calculation, not evaluated.

use serde::Serialize;

/// Extent of radiographic examination (UW-11).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Radiography {
    /// Full radiography, UW-11(a): Table UW-12 column (a).
    Full,
    /// Spot radiography, UW-11(b): column (b).
    Spot,
    /// No radiography, UW-11(c): column (c).
    None,
}

impl Radiography {
    /// Every extent with its case-file name.
    pub const ALL: [(&'static str, Radiography); 3] =
        [("full", Radiography::Full), ("spot", Radiography::Spot), ("none", Radiography::None)];

    /// The extent with this case-file name.
    pub fn from_name(s: &str) -> Option<Radiography> {
        Self::ALL.iter().find(|(n, _)| *n == s).map(|(_, r)| *r)
    }

    /// The case-file name.
    pub fn name(self) -> &'static str {
        match self {
            Radiography::Full => "full",
            Radiography::Spot => "spot",
            Radiography::None => "none",
        }
    }

    /// Words for reports.
    pub fn words(self) -> &'static str {
        match self {
            Radiography::Full => "full radiography",
            Radiography::Spot => "spot radiography",
            Radiography::None => "no radiography",
        }
    }

    /// The paragraph of UW-11 that defines the extent (from memory).
    pub fn clause(self) -> &'static str {
        match self {
            Radiography::Full => "UW-11(a)",
            Radiography::Spot => "UW-11(b)",
            Radiography::None => "UW-11(c)",
        }
    }
}

/// How a component's governing joints are made, as described in the case.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(tag = "construction", rename_all = "kebab-case")]
pub enum Joint {
    /// A welded joint of a Table UW-12 type (1 to 6).
    Welded {
        /// UW-12 joint type.
        joint_type: u8,
        /// Extent of radiography.
        radiography: Radiography,
    },
    /// A seamless shell or head; `radiography` is that of the welds joining it (UW-12(d)).
    Seamless {
        /// Extent of radiography of the joining welds.
        radiography: Radiography,
    },
}

/// Table UW-12 by joint type, from memory: a short description, the
/// efficiencies for full / spot / no radiography (`None` where the table
/// marks the cell not applicable), and the table's limitations in words.
pub const UW12: [(u8, &str, [Option<f64>; 3], &str); 6] = [
    (
        1,
        "butt joint, double-welded or equivalent full penetration",
        [Some(1.00), Some(0.85), Some(0.70)],
        "",
    ),
    (
        2,
        "single-welded butt joint with backing strip left in place",
        [Some(0.90), Some(0.80), Some(0.65)],
        "Table UW-12 limits circumferential type 2 joints with one plate offset; see the table's note for type 2.",
    ),
    (
        3,
        "single-welded butt joint without backing strip",
        [None, None, Some(0.60)],
        "Table UW-12 permits type 3 for circumferential butt joints only, not over 5/8 in (16 mm) thick and not over 24 in (610 mm) outside diameter.",
    ),
    (
        4,
        "double full fillet lap joint",
        [None, None, Some(0.55)],
        "Table UW-12 permits type 4 for longitudinal joints not over 3/8 in (10 mm) thick and circumferential joints not over 5/8 in (16 mm) thick.",
    ),
    (
        5,
        "single full fillet lap joint with plug welds",
        [None, None, Some(0.50)],
        "Table UW-12 permits type 5 only for circumferential joints attaching heads not over 24 in (610 mm) outside diameter to shells not over 1/2 in (13 mm) thick, and for heads convex to pressure with limits on thickness.",
    ),
    (
        6,
        "single full fillet lap joint without plug welds",
        [None, None, Some(0.45)],
        "Table UW-12 permits type 6 only for attaching heads convex to pressure to shells, with limits on thickness and diameter.",
    ),
];

/// Why a described joint has no efficiency.
#[derive(Debug, Clone, PartialEq)]
pub enum JointRefusal {
    /// The joint type is not one of Table UW-12's types 1 to 6.
    UnknownType(i64),
    /// The table marks this combination not applicable.
    NotPermitted {
        /// Joint type.
        joint_type: u8,
        /// Extent asked for.
        radiography: Radiography,
        /// The extents the table does give for this type.
        allowed: Vec<(Radiography, f64)>,
    },
}

impl Joint {
    /// The joint efficiency E for this construction, or why the table gives none.
    pub fn efficiency(&self) -> Result<f64, JointRefusal> {
        match *self {
            // UW-12(d): seamless shells and heads take E = 1.00 when the welds
            // joining them meet the spot radiography of UW-11(a)(5)(b), and
            // 0.85 otherwise. Full radiography satisfies spot radiography.
            Joint::Seamless { radiography } => Ok(match radiography {
                Radiography::Full | Radiography::Spot => 1.00,
                Radiography::None => 0.85,
            }),
            Joint::Welded { joint_type, radiography } => {
                let row =
                    UW12.iter().find(|r| r.0 == joint_type).ok_or(JointRefusal::UnknownType(joint_type as i64))?;
                let col = match radiography {
                    Radiography::Full => 0,
                    Radiography::Spot => 1,
                    Radiography::None => 2,
                };
                row.2[col].ok_or_else(|| JointRefusal::NotPermitted {
                    joint_type,
                    radiography,
                    allowed: Radiography::ALL
                        .iter()
                        .zip(row.2.iter())
                        .filter_map(|((_, r), e)| e.map(|e| (*r, e)))
                        .collect(),
                })
            }
        }
    }

    /// The description of the joint in words, for the step that records it.
    pub fn words(&self) -> String {
        match *self {
            Joint::Seamless { radiography } => {
                format!("seamless, joining welds with {} (UW-12(d))", radiography.words())
            }
            Joint::Welded { joint_type, radiography } => {
                let what = UW12.iter().find(|r| r.0 == joint_type).map(|r| r.1).unwrap_or("");
                format!("joint type {joint_type} ({what}), {}", radiography.words())
            }
        }
    }

    /// The clauses the look-up cites.
    pub fn clause(&self) -> String {
        match *self {
            Joint::Seamless { .. } => "UW-12(d), UW-11(a)(5)(b)".to_string(),
            Joint::Welded { radiography, .. } => {
                format!("Table UW-12, {}", radiography.clause())
            }
        }
    }

    /// The limitation Table UW-12 places on this joint type, when it has one.
    pub fn limitation(&self) -> Option<&'static str> {
        match *self {
            Joint::Seamless { .. } => None,
            Joint::Welded { joint_type, .. } => {
                UW12.iter().find(|r| r.0 == joint_type).map(|r| r.3).filter(|s| !s.is_empty())
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn e(joint_type: u8, r: Radiography) -> Result<f64, JointRefusal> {
        Joint::Welded { joint_type, radiography: r }.efficiency()
    }

    #[test]
    fn every_cell_of_table_uw12() {
        use Radiography::*;
        // ASME BPVC VIII-1 Table UW-12, from memory: type 1 1.00/0.85/0.70,
        // type 2 0.90/0.80/0.65, types 3 to 6 only without radiography:
        // 0.60, 0.55, 0.50, 0.45.
        assert_eq!(e(1, Full), Ok(1.00));
        assert_eq!(e(1, Spot), Ok(0.85));
        assert_eq!(e(1, None), Ok(0.70));
        assert_eq!(e(2, Full), Ok(0.90));
        assert_eq!(e(2, Spot), Ok(0.80));
        assert_eq!(e(2, None), Ok(0.65));
        assert_eq!(e(3, None), Ok(0.60));
        assert_eq!(e(4, None), Ok(0.55));
        assert_eq!(e(5, None), Ok(0.50));
        assert_eq!(e(6, None), Ok(0.45));
        for t in 3..=6 {
            for r in [Full, Spot] {
                assert!(matches!(e(t, r), Err(JointRefusal::NotPermitted { .. })), "type {t} {r:?}");
            }
        }
        assert_eq!(e(7, Full), Err(JointRefusal::UnknownType(7)));
    }

    #[test]
    fn seamless_per_uw12_d() {
        // UW-12(d) (from memory): 1.00 with spot radiography of the joining welds, else 0.85.
        let s = |r| Joint::Seamless { radiography: r }.efficiency();
        assert_eq!(s(Radiography::Spot), Ok(1.00));
        assert_eq!(s(Radiography::Full), Ok(1.00));
        assert_eq!(s(Radiography::None), Ok(0.85));
    }

    #[test]
    fn a_refusal_lists_what_the_table_allows() {
        let Err(JointRefusal::NotPermitted { allowed, .. }) = e(3, Radiography::Spot) else {
            panic!("type 3 with spot radiography must be refused");
        };
        assert_eq!(allowed, vec![(Radiography::None, 0.60)]);
    }
}
