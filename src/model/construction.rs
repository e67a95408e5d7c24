//! Reading the inputs about how the vessel is made: materials named from a
//! library, the joint description behind a joint efficiency, the product
//! form with its mill under-tolerance, the pipe size of a cylinder made from
//! pipe and the `[stock]` thickness list.
//!
//! A child of [`crate::model`] so that it shares the model's [`Reader`] and
//! its diagnostics.

use super::{span_of, Component, Material, Reader, Undertolerance};
use crate::case::{CaseFile, RawComponent, RawMaterial, Scalar, Value};
use crate::diag::Diagnostic;
use crate::joints::{Joint, JointRefusal, Radiography};
use crate::materials::{Library, LibraryMaterial, ProductForm};
use crate::model::{Diameter, LibraryLookup, PlateStock, DEFAULT_STEEL_DENSITY};
use crate::stock::{pipe_size_for, PipeSize};
use crate::units::{Kind, Quantity, UnitSystem};
use std::collections::BTreeMap;
use std::ops::Range;
use toml::Spanned;

/// The libraries a case names, by the path written in the case: the parsed
/// library, or why it could not be read.
pub type Libraries = BTreeMap<String, Result<Library, String>>;

/// A temperature from `[design]` with the span of its key, when written.
#[derive(Clone)]
pub(super) struct Temperature {
    pub value: Quantity,
    pub key: &'static str,
    pub span: Option<Range<usize>>,
    pub written: String,
}

/// Reads one `[materials.<key>]`: stresses given directly, or looked up in a
/// library table at the design and test temperatures.
pub(super) fn read_material(
    r: &mut Reader,
    key: &str,
    m: &Spanned<RawMaterial>,
    libraries: &Libraries,
    design_t: Option<&Temperature>,
    test_t: &Temperature,
) -> Option<Material> {
    let span = span_of(m);
    let m = m.get_ref();
    let k = |f: &str| format!("materials.{key}.{f}");
    if m.library.is_some() || m.entry.is_some() {
        return library_material(r, key, m, span, libraries, design_t, test_t);
    }
    let name = r
        .required(&k("name"), &m.name, span.clone(), "the specification and grade, e.g. \"SA-516 Grade 70\"")
        .map(|s| s.get_ref().clone());
    let s = r
        .required(
            &k("allowable_stress"),
            &m.allowable_stress,
            span.clone(),
            "the allowable stress at design temperature, e.g. \"138 MPa\", or `library` and `entry` naming a library material",
        )
        .and_then(|v| r.positive(&k("allowable_stress"), v, Kind::Stress));
    let st = match &m.test_allowable_stress {
        Some(v) => r.positive(&k("test_allowable_stress"), v, Kind::Stress),
        None => s,
    };
    let rho = match &m.density {
        Some(v) => r.positive(&k("density"), v, Kind::Density),
        None => Some(Quantity::new(DEFAULT_STEEL_DENSITY, Kind::Density)),
    };
    let form = match &m.product_form {
        None => Some(ProductForm::Plate),
        Some(f) => {
            let form = ProductForm::from_name(f.get_ref());
            if form.is_none() {
                r.err(
                    Diagnostic::new(
                        k("product_form"),
                        Some(f.span()),
                        format!("unknown product form `{}`", f.get_ref()),
                    )
                    .expected(format!("one of: {}", ProductForm::names())),
                );
            }
            form
        }
    };
    let part = match &m.part {
        Some(p) => {
            let known = crate::materials::part_name(p.get_ref());
            if known.is_none() {
                r.err(crate::materials::unknown_part(k("part"), p));
            }
            known
        }
        None => None,
    };
    Some(Material {
        key: key.to_string(),
        name: name?,
        allowable_stress: s?,
        test_allowable_stress: st?,
        density: rho?,
        product_form: form?,
        part,
        library: None,
    })
}

fn library_material(
    r: &mut Reader,
    key: &str,
    m: &RawMaterial,
    span: Option<Range<usize>>,
    libraries: &Libraries,
    design_t: Option<&Temperature>,
    test_t: &Temperature,
) -> Option<Material> {
    let k = |f: &str| format!("materials.{key}.{f}");
    let before = r.errors.len();
    // The library is the one source of these values; a second one in the
    // case file would leave the reader guessing which was used.
    for (f, s) in [
        ("allowable_stress", m.allowable_stress.as_ref().map(|v| v.span())),
        ("test_allowable_stress", m.test_allowable_stress.as_ref().map(|v| v.span())),
        ("density", m.density.as_ref().map(|v| v.span())),
        ("product_form", m.product_form.as_ref().map(|v| v.span())),
        ("part", m.part.as_ref().map(|v| v.span())),
    ] {
        if s.is_some() {
            r.err(Diagnostic::new(k(f), s, format!("`{f}` cannot be given for a material taken from a library")).hint(
                "remove the key (the library gives it), or remove `library` and `entry` and give the values directly",
            ));
        }
    }
    let path = r.required(
        &k("library"),
        &m.library,
        span.clone(),
        "the library file, relative to the case file, e.g. \"../materials/example-library.toml\"",
    );
    let entry =
        r.required(&k("entry"), &m.entry, span.clone(), "the material's key in the library, e.g. \"sa-516-70\"");
    let (path, entry) = (path?, entry?);
    let library = match libraries.get(path.get_ref()) {
        Some(Ok(lib)) => lib,
        Some(Err(why)) => {
            r.err(
                Diagnostic::new(
                    k("library"),
                    span_of(path),
                    format!("cannot read library file `{}`: {why}", path.get_ref()),
                )
                .expected("a readable library file; the path is relative to the case file's folder"),
            );
            return None;
        }
        None => {
            r.err(
                Diagnostic::new(
                    k("library"),
                    span_of(path),
                    format!("library file `{}` was not loaded", path.get_ref()),
                )
                .hint("this entry point reads no files; use `pipeline::evaluate_with` with a loader"),
            );
            return None;
        }
    };
    let Some(lm) = library.materials.get(entry.get_ref()) else {
        let known: Vec<&str> = library.materials.keys().map(String::as_str).collect();
        r.err(
            Diagnostic::new(
                k("entry"),
                span_of(entry),
                format!("library `{}` has no material `{}`", library.file, entry.get_ref()),
            )
            .expected(format!("one of: {}", known.join(", ")))
            .hint("`knuckle materials --library FILE` lists a library"),
        );
        return None;
    };
    let design = design_t.and_then(|t| bracket(r, key, lm, library, t, span_of(entry)));
    let test = bracket(r, key, lm, library, test_t, span_of(entry));
    if r.errors.len() > before {
        return None;
    }
    let (design, test) = (design?, test?);
    let stress = |r: &mut Reader, b: &crate::materials::Bracket| match b.stress() {
        Ok(q) => Some(q),
        Err(e) => {
            r.err(Diagnostic::new(k("entry"), span_of(entry), e.to_string()));
            None
        }
    };
    let s = stress(r, &design)?;
    let st = stress(r, &test)?;
    Some(Material {
        key: key.to_string(),
        name: m.name.as_ref().map(|n| n.get_ref().clone()).unwrap_or_else(|| lm.name()),
        allowable_stress: s,
        test_allowable_stress: st,
        density: lm.density,
        product_form: lm.product_form,
        part: lm.part.clone(),
        library: Some(LibraryLookup {
            // The path as written in the case (relative to it), so that the
            // design and its digest do not depend on the working folder.
            file: path.get_ref().clone(),
            caution: library.caution.clone(),
            material: lm.clone(),
            design,
            test,
        }),
    })
}

/// The bracketing rows at a temperature, or an input error naming the
/// material and the table's range: tables are never extrapolated.
fn bracket(
    r: &mut Reader,
    key: &str,
    lm: &LibraryMaterial,
    library: &Library,
    t: &Temperature,
    entry_span: Option<Range<usize>>,
) -> Option<crate::materials::Bracket> {
    if let Some(b) = lm.table.bracket(t.value) {
        return Some(b);
    }
    let what = if t.key == "design.test_temperature" { "test temperature" } else { "design temperature" };
    let (span, shown) = match &t.span {
        Some(s) => (Some(s.clone()), format!("`{}` = \"{}\"", t.key, t.written)),
        // A default test temperature has no key of its own: point at the entry.
        None => (entry_span, format!("the default test temperature {}", t.written)),
    };
    r.err(
        Diagnostic::new(
            t.key,
            span,
            format!(
                "{shown} ({}) is outside the allowable-stress table of material `{key}` (`{}`, {}, in `{}`), which covers {}",
                lm.table.show_temperature(t.value),
                lm.key,
                lm.name(),
                library.file,
                lm.table.range_text()
            ),
        )
        .expected(format!(
            "a {what} from {} (tables are not extrapolated)",
            lm.table.range_text()
        ))
        .hint("choose a material whose table covers the temperature, or extend the table in the library from the code's stress tables"),
    );
    None
}

/// How the case gives the joint efficiency of a component.
pub(super) enum JointInput<'a> {
    /// `joint_efficiency` given as a number.
    Given(&'a Value),
    /// A joint description with its looked-up efficiency.
    Described(Joint, f64),
}

/// Reads exactly one of `joint_efficiency` or the joint description.
pub(super) fn read_joint<'a>(
    r: &mut Reader,
    i: usize,
    c: &'a RawComponent,
    span: Option<Range<usize>>,
) -> Option<JointInput<'a>> {
    let k = |f: &str| format!("component[{i}].{f}");
    let described = c.joint_type.is_some() || c.radiography.is_some() || c.seamless.is_some();
    if let Some(e) = &c.joint_efficiency {
        if described {
            r.err(
                Diagnostic::new(
                    k("joint_efficiency"),
                    Some(e.span()),
                    "both `joint_efficiency` and a joint description (`joint_type`, `radiography`, `seamless`) are given",
                )
                .expected("exactly one of `joint_efficiency` or the joint description")
                .hint("remove `joint_efficiency` to have it looked up in Table UW-12, or remove the description"),
            );
            return None;
        }
        return Some(JointInput::Given(e));
    }
    if !described {
        r.err(
            Diagnostic::new(
                k("joint_efficiency"),
                span,
                "the joint efficiency is not given",
            )
            .expected("`joint_efficiency = 0.85`, or `joint_type = 1` with `radiography = \"spot\"`, or `seamless = true` with `radiography = \"spot\"`"),
        );
        return None;
    }
    let radiography = match &c.radiography {
        Some(s) => match Radiography::from_name(s.get_ref()) {
            Some(x) => Some((x, s.span())),
            None => {
                r.err(
                    Diagnostic::new(
                        k("radiography"),
                        Some(s.span()),
                        format!("unknown extent of radiography `{}`", s.get_ref()),
                    )
                    .expected("\"full\", \"spot\" or \"none\" (UW-11)"),
                );
                return None;
            }
        },
        None => {
            r.err(
                Diagnostic::new(
                    k("radiography"),
                    span.clone(),
                    "the joint is described but the extent of radiography is not given",
                )
                .expected("radiography = \"full\", \"spot\" or \"none\" (UW-11)"),
            );
            return None;
        }
    };
    let (radiography, rad_span) = radiography?;
    let seamless = c.seamless.as_ref().map(|s| (*s.get_ref(), s.span()));
    let joint = match (&c.joint_type, seamless) {
        (Some(_), Some((true, s))) => {
            r.err(
                Diagnostic::new(k("seamless"), Some(s), "`seamless = true` and `joint_type` are both given")
                    .expected("either a seamless part (UW-12(d)) or a welded joint type, not both"),
            );
            return None;
        }
        (None, Some((true, _))) => Joint::Seamless { radiography },
        (None, _) => {
            r.err(
                Diagnostic::new(k("joint_type"), span, "the joint is described but `joint_type` is not given")
                    .expected("joint_type = 1 to 6 (Table UW-12), or `seamless = true`"),
            );
            return None;
        }
        (Some(t), _) => {
            let n = match t.get_ref() {
                Scalar::Int(n) => *n,
                _ => {
                    r.err(
                        Diagnostic::new(k("joint_type"), Some(t.span()), "`joint_type` must be a whole number")
                            .expected("1 to 6 (Table UW-12)"),
                    );
                    return None;
                }
            };
            match u8::try_from(n) {
                Ok(joint_type) if (1..=6).contains(&joint_type) => Joint::Welded { joint_type, radiography },
                _ => {
                    r.err(
                        Diagnostic::new(
                            k("joint_type"),
                            Some(t.span()),
                            format!("joint type {n} is not one of Table UW-12's types 1 to 6"),
                        )
                        .expected("1 to 6")
                        .hint("for other joints give `joint_efficiency` directly"),
                    );
                    return None;
                }
            }
        }
    };
    match joint.efficiency() {
        Ok(e) => Some(JointInput::Described(joint, e)),
        Err(JointRefusal::NotPermitted { joint_type, radiography, allowed }) => {
            let ok: Vec<String> =
                allowed.iter().map(|(r, e)| format!("radiography = \"{}\" (E = {:.2})", r.name(), e)).collect();
            r.err(
                Diagnostic::new(
                    k("radiography"),
                    Some(rad_span),
                    format!(
                        "Table UW-12 gives no efficiency for joint type {joint_type} with {}",
                        radiography.words()
                    ),
                )
                .expected(format!("for joint type {joint_type}: {}", ok.join(" or ")))
                .hint("the table marks this combination not applicable; change the joint type or the extent of radiography"),
            );
            None
        }
        Err(JointRefusal::UnknownType(n)) => {
            r.err(Diagnostic::new(
                k("joint_type"),
                c.joint_type.as_ref().map(|t| t.span()),
                format!("joint type {n} is not one of Table UW-12's types 1 to 6"),
            ));
            None
        }
    }
}

/// Reads `mill_undertolerance`: a length, or a percentage of the nominal
/// thickness written with `%`.
pub(super) fn read_undertolerance(
    r: &mut Reader,
    i: usize,
    c: &RawComponent,
    form: ProductForm,
) -> Option<Option<Undertolerance>> {
    let key = format!("component[{i}].mill_undertolerance");
    let Some(v) = &c.mill_undertolerance else {
        return Some(None);
    };
    if form == ProductForm::Forging {
        r.err(
            Diagnostic::new(
                key,
                Some(v.span()),
                "a mill under-tolerance does not apply to a forging, which is machined to size",
            )
            .hint("remove `mill_undertolerance`, or check the material's product form"),
        );
        return None;
    }
    if let Scalar::Text(t) = v.get_ref() {
        if let Some(num) = t.trim().strip_suffix('%') {
            return match num.trim().parse::<f64>() {
                Ok(p) if p.is_finite() && (0.0..50.0).contains(&p) => Some(Some(Undertolerance::Fraction(p / 100.0))),
                _ => {
                    r.err(
                        Diagnostic::new(
                            key,
                            Some(v.span()),
                            format!("`{}` is not a percentage from 0 % to below 50 %", t.trim()),
                        )
                        .expected("a percentage such as \"12.5 %\", or a length such as \"0.3 mm\""),
                    );
                    None
                }
            };
        }
    }
    r.non_negative(&key, v, Kind::Length).map(|q| Some(Undertolerance::Length(q)))
}

/// The pipe size of a cylinder made from pipe whose wall is to be selected.
/// A part of pipe material that needs a selection but is not such a
/// cylinder is an input error.
#[allow(clippy::too_many_arguments)]
pub(super) fn read_pipe_size(
    r: &mut Reader,
    i: usize,
    c: &RawComponent,
    span: Option<Range<usize>>,
    form: ProductForm,
    kind_name: &str,
    diameter: Option<Diameter>,
    nominal_given: bool,
) -> Option<Option<PipeSize>> {
    if form != ProductForm::Pipe {
        return Some(None);
    }
    let k = |f: &str| format!("component[{i}].{f}");
    let material_span = c.material.as_ref().map(|m| m.span()).or(span.clone());
    let od = match diameter {
        Some(Diameter::Outside(od)) => Some(od),
        _ => None,
    };
    let size = od.and_then(pipe_size_for).copied();
    if nominal_given {
        // The size is only used to name the pipe in the order list.
        return Some(size);
    }
    if kind_name != "cylinder" {
        r.err(
            Diagnostic::new(
                k("nominal_thickness"),
                material_span,
                format!("a {kind_name} of pipe material needs `nominal_thickness`: walls are selected from pipe schedules for cylinders only"),
            )
            .hint("give `nominal_thickness`, or use a plate material"),
        );
        return None;
    }
    let Diameter::Outside(od) = diameter? else {
        r.err(
            Diagnostic::new(
                k("inside_diameter"),
                c.inside_diameter.as_ref().map(|v| v.span()),
                "a cylinder made from pipe needs `outside_diameter` to select a schedule",
            )
            .expected("outside_diameter equal to a pipe size's outside diameter, e.g. \"168.3 mm\" (NPS 6)")
            .hint("or give `nominal_thickness`"),
        );
        return None;
    };
    if size.is_none() {
        let sizes: Vec<String> =
            crate::stock::PIPE_SIZES.iter().map(|p| format!("NPS {} ({} in)", p.nps, p.outside_diameter_in)).collect();
        r.err(
            Diagnostic::new(
                k("outside_diameter"),
                c.outside_diameter.as_ref().map(|v| v.span()),
                format!("outside diameter {} matches no pipe size in the schedule table", UnitSystem::Si.display(od)),
            )
            .expected(format!("one of: {}", sizes.join(", ")))
            .hint("give `nominal_thickness` for other sizes"),
        );
        return None;
    }
    Some(size)
}

/// Reads `[stock]`, or the default plate list of the case's code values
/// (the SI list when they are not stated). Never the report units: the same
/// case gives the same plates whatever units it is reported in.
pub(super) fn read_stock(r: &mut Reader, case: &CaseFile, code_values: Option<UnitSystem>) -> PlateStock {
    let default = PlateStock {
        thicknesses: crate::stock::default_plate_list(code_values.unwrap_or(UnitSystem::Si)),
        source: match code_values {
            Some(UnitSystem::Si) => "default SI plate list".to_string(),
            Some(UnitSystem::Us) => "default US plate list".to_string(),
            None => "default SI plate list (design.code_values not stated)".to_string(),
        },
    };
    let Some(list) = case.stock.as_ref().and_then(|s| s.get_ref().plate_thicknesses.as_ref()) else {
        return default;
    };
    if list.get_ref().is_empty() {
        r.err(
            Diagnostic::new("stock.plate_thicknesses", span_of(list), "`stock.plate_thicknesses` is empty")
                .expected("a list of thicknesses, e.g. [\"6 mm\", \"8 mm\", \"10 mm\"]"),
        );
        return default;
    }
    let mut thicknesses = Vec::new();
    for (n, v) in list.get_ref().iter().enumerate() {
        if let Some(q) = r.positive(&format!("stock.plate_thicknesses[{n}]"), v, Kind::Length) {
            thicknesses.push(q);
        }
    }
    thicknesses.sort_by(|a, b| a.value.total_cmp(&b.value));
    PlateStock { thicknesses, source: "plate list of the case file ([stock] plate_thicknesses)".to_string() }
}

/// The product form of a component's material; plate when the material is
/// unknown (that error is reported where the material key is read).
pub(super) fn product_form_of(material: Option<&String>, validated: &BTreeMap<String, Material>) -> ProductForm {
    material.and_then(|m| validated.get(m)).map(|m| m.product_form).unwrap_or(ProductForm::Plate)
}

impl Component {
    /// The material's product form decides the thickness list and tolerance rule.
    pub fn is_pipe(&self) -> bool {
        self.product_form == ProductForm::Pipe
    }
}
