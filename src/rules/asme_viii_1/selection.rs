//! The nominal thickness: the given one with its mill under-tolerance, or
//! the thinnest commercial thickness that covers the minimum thickness.
//!
//! Mill under-tolerance: plate per UG-16(c), where nothing is deducted while
//! the under-tolerance is no more than the smaller of 0.3 mm (0.01 in) and
//! 6 % of the ordered thickness, and the whole under-tolerance is deducted
//! beyond that; pipe per UG-16(d), 12.5 % of the nominal wall unless another
//! value is stated; forgings are machined to size and have none.

use crate::calc::{CalcError, Sheet};
use crate::materials::ProductForm;
use crate::model::{Component, ComponentKind, Design, Undertolerance};
use crate::stock::{search, Candidate};
use crate::units::{Kind, Quantity, UnitSystem, INCH};

/// The pipe under-tolerance of UG-16(d) when none is stated.
pub const PIPE_UNDERTOLERANCE: f64 = 0.125;

/// The fixed part of the UG-16(c) plate allowance: 0.01 in or 0.3 mm.
pub const UG16C_ALLOWANCE: super::PairedValue =
    super::PairedValue { us_text: "0.01 in", us: 0.01 * INCH, si_text: "0.3 mm", si: 0.3e-3 };

/// The fixed part of the UG-16(c) allowance for the case's code values (the
/// smaller of the two when not stated), with words saying which was taken.
pub fn ug16c_allowance(code_values: Option<UnitSystem>) -> (Quantity, String) {
    UG16C_ALLOWANCE.choose(code_values, false)
}

/// The nominal thickness the MAWP is computed with.
#[derive(Debug, Clone, PartialEq)]
pub struct Nominal {
    /// Nominal (ordered) thickness, bound as `t_n`.
    pub thickness: Quantity,
    /// Whether a mill under-tolerance `t_u` is deducted from it.
    pub deducts: bool,
    /// The commercial thickness selected, when none was given.
    pub selected: Option<Candidate>,
}

/// The amount deducted from a nominal thickness `t` (SI), by the same rule as
/// [`delivered`] records on the sheet; used to search the lists.
pub fn deduction(c: &Component, code_values: Option<UnitSystem>, t: f64) -> f64 {
    match (c.product_form, c.mill_undertolerance) {
        (ProductForm::Forging, _) | (ProductForm::Plate, None) => 0.0,
        (ProductForm::Plate, Some(u)) => {
            let a = u.amount(t);
            let lim = ug16c_allowance(code_values).0.value.min(0.06 * t);
            if a <= lim * (1.0 + 1e-12) {
                0.0
            } else {
                a
            }
        }
        (ProductForm::Pipe, None) => PIPE_UNDERTOLERANCE * t,
        (ProductForm::Pipe, Some(u)) => u.amount(t),
    }
}

/// Records the mill under-tolerance for the `t_n` bound on the sheet and
/// returns the delivered thickness `t_d`, or `None` when nothing is deducted.
pub fn delivered(s: &mut Sheet, c: &Component, code_values: Option<UnitSystem>) -> Result<Option<Quantity>, CalcError> {
    use super::formulas as f;
    let units = s.units();
    match (c.product_form, c.mill_undertolerance) {
        (ProductForm::Forging, _) | (ProductForm::Plate, None) => Ok(None),
        (ProductForm::Plate, Some(u)) => {
            let u_q = match u {
                Undertolerance::Length(q) => s.input("u", "stated mill under-tolerance of the plate", q),
                Undertolerance::Fraction(x) => {
                    s.input(
                        "u_p",
                        "stated mill under-tolerance of the plate, as a fraction of the ordered thickness",
                        Quantity::new(x, Kind::Dimensionless),
                    );
                    s.step(&f::PLATE_UNDERTOL_FRACTION, "stated mill under-tolerance of the plate")?
                }
            };
            let (u_c, words) = ug16c_allowance(code_values);
            s.record("u_c", "fixed part of the UG-16(c) allowance", "UG-16(c)", &format!("uc = {words}"), u_c);
            let lim = s.step(
                &f::PLATE_UNDERTOL_LIMIT,
                "under-tolerance that needs no allowance: the smaller of u_c and 6 % of the ordered thickness",
            )?;
            if u_q.value <= lim.value * (1.0 + 1e-12) {
                s.record(
                    "t_u",
                    "under-tolerance deducted: none, the plate may be used at the full design pressure for the thickness ordered",
                    "UG-16(c)",
                    &format!("tu = 0 because u = {} ≤ ulim = {}", units.display(u_q), units.display(lim)),
                    Quantity::new(0.0, Kind::Length),
                );
                return Ok(None);
            }
            s.record(
                "t_u",
                "under-tolerance deducted: all of it, since it exceeds the UG-16(c) allowance",
                "UG-16(c)",
                &format!("tu = u because u = {} > ulim = {}", units.display(u_q), units.display(lim)),
                u_q,
            );
            Ok(Some(s.step(&f::DELIVERED_THICKNESS, "thickness as delivered, at the under-tolerance")?))
        }
        (ProductForm::Pipe, u) => {
            match u {
                None => {
                    s.input(
                        "u_p",
                        "mill under-tolerance of pipe: 12.5 % of the nominal wall (UG-16(d); none stated)",
                        Quantity::new(PIPE_UNDERTOLERANCE, Kind::Dimensionless),
                    );
                    s.step(&f::PIPE_UNDERTOL, "mill under-tolerance of the pipe wall")?;
                }
                Some(Undertolerance::Fraction(x)) => {
                    s.input(
                        "u_p",
                        "stated mill under-tolerance of the pipe, as a fraction of the nominal wall",
                        Quantity::new(x, Kind::Dimensionless),
                    );
                    s.step(&f::PIPE_UNDERTOL, "mill under-tolerance of the pipe wall")?;
                }
                Some(Undertolerance::Length(q)) => {
                    s.input("t_u", "stated mill under-tolerance of the pipe wall", q);
                }
            }
            Ok(Some(s.step(&f::DELIVERED_THICKNESS, "wall as delivered, at the under-tolerance")?))
        }
    }
}

/// The candidates a component's thickness is selected from, and the list's name.
fn candidates(design: &Design, c: &Component) -> (Vec<Candidate>, String) {
    if let (ComponentKind::Cylinder, Some(p)) = (&c.kind, &c.pipe_size) {
        if c.is_pipe() {
            return (
                p.candidates(),
                format!("pipe schedules of NPS {} (wall thicknesses from memory of ASME B36.10M)", p.nps),
            );
        }
    }
    let form = c.product_form.name();
    let list = design
        .stock
        .thicknesses
        .iter()
        .map(|t| Candidate { thickness: *t, label: format!("{} {form}", design.units.display(*t)) })
        .collect();
    (list, design.stock.source.clone())
}

/// Binds `t_n`: the given nominal thickness with its check, or the selected
/// commercial thickness with the rejected next thinner one and the check.
pub fn nominal(s: &mut Sheet, design: &Design, c: &Component, minimum: Quantity) -> Result<Nominal, CalcError> {
    let units = s.units();
    if let Some(t) = c.nominal_thickness {
        s.input("t_n", "nominal thickness", t);
        let d = delivered(s, c, design.conditions.code_values)?;
        match d {
            None => s.check_at_least(
                "nominal thickness covers the minimum thickness",
                "UG-16, UG-25, UG-27/UG-32",
                minimum,
                t,
                "the nominal thickness is less than the minimum required; choose a thicker plate",
            ),
            Some(td) => s.check_at_least(
                "thickness as delivered (nominal less mill under-tolerance) covers the minimum thickness",
                "UG-16(c), UG-16(d), UG-27/UG-32",
                minimum,
                td,
                "the nominal thickness less the mill under-tolerance is below the minimum required; choose a thicker plate or schedule",
            ),
        };
        return Ok(Nominal { thickness: t, deducts: d.is_some(), selected: None });
    }
    let (list, list_name) = candidates(design, c);
    let found = search(&list, minimum.value, &|t| deduction(c, design.conditions.code_values, t));
    let chosen = found.selected.or(found.thinner);
    let Some(chosen) = chosen else {
        return Err(CalcError::OutOfRange { component: c.id.clone(), message: "the thickness list is empty".into() });
    };
    if let (Some(_), Some(j)) = (found.selected, found.thinner) {
        let thinner = &list[j];
        s.input("t_n", &format!("candidate {}: the next thinner in the {list_name}", thinner.label), thinner.thickness);
        let td = delivered(s, c, design.conditions.code_values)?.unwrap_or(thinner.thickness);
        s.record(
            "t_d",
            &format!("{} is rejected: its delivered thickness is below the minimum thickness", thinner.label),
            "UG-16",
            &format!("td = {} < tm = {}", units.display(td), units.display_up(minimum)),
            td,
        );
    }
    let pick = &list[chosen];
    let words = if found.selected.is_some() {
        format!(
            "selected nominal thickness: {}, the thinnest in the {list_name} that covers the minimum thickness",
            pick.label
        )
    } else {
        format!("no thickness in the {list_name} covers the minimum thickness; the thickest, {}, is shown", pick.label)
    };
    let t = s.input("t_n", &words, pick.thickness);
    let d = delivered(s, c, design.conditions.code_values)?;
    s.check_at_least(
        "selected nominal thickness covers the minimum thickness",
        "UG-16, UG-25, UG-27/UG-32",
        minimum,
        d.unwrap_or(t),
        "no commercial thickness in the list covers the minimum thickness; extend the list ([stock] plate_thicknesses) or give `nominal_thickness`",
    );
    Ok(Nominal { thickness: t, deducts: d.is_some(), selected: Some(pick.clone()) })
}
