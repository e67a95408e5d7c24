//! `knuckle new PATH` and `knuckle schema`.

use super::{EXIT_INPUT, EXIT_OK};
use serde_json::{json, Value};
use std::path::Path;

/// The commented starter case file (an invented demo vessel).
pub const STARTER: &str = include_str!("starter.toml");

/// Writes the starter file, refusing to overwrite.
pub fn write_new(path: &Path) -> i32 {
    if path.exists() {
        eprintln!("error: `{}` already exists; choose another path (nothing was written)", path.display());
        return EXIT_INPUT;
    }
    match crate::fsio::write_atomic(path, STARTER.as_bytes()) {
        Ok(()) => {
            println!("wrote {}", path.display());
            EXIT_OK
        }
        Err(e) => {
            eprintln!("error: cannot write `{}`: {e}", path.display());
            EXIT_INPUT
        }
    }
}

fn quantity(desc: &str, example: &str) -> Value {
    json!({ "type": "string", "description": desc, "examples": [example], "pattern": "^\\s*[-+]?[0-9.]+([eE][-+]?[0-9]+)?\\s*\\S+\\s*$" })
}

/// The JSON Schema (draft 2020-12) of the case file.
pub fn schema() -> Value {
    let component_types: Vec<&str> = crate::model::COMPONENT_TYPES.to_vec();
    let shapes: Vec<&str> = crate::model::TorisphereShape::ALL.iter().map(|(n, _)| *n).collect();
    let forms: Vec<&str> = crate::materials::ProductForm::ALL.iter().map(|(n, _)| *n).collect();
    let radiography: Vec<&str> = crate::joints::Radiography::ALL.iter().map(|(n, _)| *n).collect();
    // Built in parts: one `json!` of the whole schema exceeds the macro's recursion limit.
    let material_one_of = json!([
        {"required": ["name", "allowable_stress"], "not": {"anyOf": [{"required": ["library"]}, {"required": ["entry"]}]}},
        {"required": ["library", "entry"], "not": {"anyOf": [{"required": ["allowable_stress"]}, {"required": ["test_allowable_stress"]}, {"required": ["density"]}, {"required": ["product_form"]}, {"required": ["part"]}]}}
    ]);
    let joint_one_of = json!([
        {"required": ["joint_efficiency"], "not": {"anyOf": [{"required": ["joint_type"]}, {"required": ["radiography"]}, {"required": ["seamless"]}]}},
        {"required": ["joint_type", "radiography"], "not": {"anyOf": [{"required": ["joint_efficiency"]}, {"properties": {"seamless": {"const": true}}, "required": ["seamless"]}]}},
        {"required": ["seamless", "radiography"], "properties": {"seamless": {"const": true}}, "not": {"anyOf": [{"required": ["joint_efficiency"]}, {"required": ["joint_type"]}]}}
    ]);
    let component_properties = json!({
                        "id": {"type": "string"},
                        "type": {"enum": component_types},
                        "material": {"type": "string"},
                        "inside_diameter": quantity("inside diameter (large end of a cone)", "1800 mm"),
                        "outside_diameter": quantity("outside diameter (large end of a cone)", "1824 mm"),
                        "nominal_thickness": quantity("nominal thickness", "12 mm"),
                        "joint_efficiency": {"type": "number", "exclusiveMinimum": 0, "maximum": 1},
                        "circumferential_joint_efficiency": {"type": "number", "exclusiveMinimum": 0, "maximum": 1},
                        "joint_type": {"type": "integer", "minimum": 1, "maximum": 6, "description": "joint type of Table UW-12, instead of joint_efficiency"},
                        "radiography": {"enum": radiography, "description": "extent of radiography (UW-11)"},
                        "seamless": {"type": "boolean", "description": "seamless shell or head (UW-12(d)); radiography is that of the joining welds"},
                        "mill_undertolerance": {"type": "string", "description": "mill under-tolerance: a length, or a percentage of the nominal thickness", "examples": ["0.3 mm", "12.5 %"]},
                        "liquid_head": quantity("static liquid head at the lowest point", "2.4 m"),
                        "length": quantity("length (cylinders, cones)", "4200 mm"),
                        "corrosion_allowance": quantity("corrosion allowance for this component", "3 mm"),
                        "aspect_ratio": {"type": "number", "minimum": 1.0, "maximum": 3.0, "description": "ellipsoidal heads: D/2h"},
                        "straight_flange": quantity("formed heads: straight flange", "50 mm"),
                        "thinning_allowance": quantity("formed heads: thinning allowance", "1.5 mm"),
                        "crown_radius": quantity("torispherical heads: inside crown radius", "1620 mm"),
                        "knuckle_radius": quantity("torispherical heads: inside knuckle radius", "306 mm"),
                        "shape": {"enum": shapes},
                        "small_inside_diameter": quantity("cones: inside diameter at the small end", "1000 mm"),
                        "small_outside_diameter": quantity("cones: outside diameter at the small end", "1020 mm"),
                        "half_apex_angle": quantity("cones: half-apex angle", "20 deg"),
    });
    let stock = json!({
        "type": "object", "additionalProperties": false,
        "properties": {
            "plate_thicknesses": {
                "type": "array", "minItems": 1,
                "description": "plate thicknesses a nominal thickness is selected from, replacing the default list",
                "items": quantity("a plate thickness", "10 mm")
            }
        }
    });
    json!({
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "title": "Knuckle case file",
        "description": "One calculation document: identity, design conditions, materials and pressure parts. Quantities are strings with units.",
        "type": "object",
        "additionalProperties": false,
        "required": ["document", "design", "component"],
        "properties": {
            "document": {
                "type": "object", "additionalProperties": false,
                "required": ["number", "revision", "date"],
                "properties": {
                    "number": { "type": "string", "description": "document number" },
                    "title": { "type": "string" },
                    "project": { "type": "string" },
                    "revision": { "type": "string" },
                    "date": { "type": "string", "format": "date" },
                    "rules": { "enum": crate::model::RULE_SETS },
                    "edition": { "enum": crate::rules::asme_viii_1::EDITIONS },
                    "units": { "enum": ["SI", "US"] },
                    "history": { "type": "array", "items": {
                        "type": "object", "additionalProperties": false, "required": ["revision", "date"],
                        "properties": { "revision": {"type": "string"}, "date": {"type": "string", "format": "date"}, "note": {"type": "string"} }
                    }}
                }
            },
            "sign_off": {
                "type": "object", "additionalProperties": false,
                "properties": { "prepared_by": {"type": "string"}, "checked_by": {"type": "string"}, "approved_by": {"type": "string"} }
            },
            "design": {
                "type": "object", "additionalProperties": false,
                "required": ["internal_pressure", "temperature"],
                "properties": {
                    "internal_pressure": quantity("design pressure at the top of the vessel", "1.0 MPa"),
                    "temperature": quantity("design temperature", "150 degC"),
                    "corrosion_allowance": quantity("default corrosion allowance", "3 mm"),
                    "liquid_density": quantity("liquid density for static head", "1000 kg/m3"),
                    "test_temperature": quantity("test temperature for library stresses (default 20 degC)", "20 degC"),
                    "service": {"enum": ["compressed-air", "steam", "water", "other"], "description": "service, for the UG-16(b) minimum thickness"},
                    "code_values": {"enum": ["SI", "US"], "description": "which of the code's paired SI and US values apply (default: the more conservative of each pair)"},
                }
            },
            "stock": stock,
            "materials": {
                "type": "object",
                "additionalProperties": {
                    "type": "object", "additionalProperties": false,
                    "oneOf": material_one_of,
                    "properties": {
                        "name": {"type": "string"},
                        "allowable_stress": quantity("allowable stress at design temperature", "138 MPa"),
                        "test_allowable_stress": quantity("allowable stress at test temperature", "138 MPa"),
                        "density": quantity("metal density", "7850 kg/m3"),
                        "product_form": {"enum": forms, "description": "product form of a material given directly (default plate)"},
                        "part": {"enum": crate::materials::MATERIAL_PARTS, "description": "part of Subsection C of a material given directly (UCS for carbon and low-alloy steels)"},
                        "library": {"type": "string", "description": "materials library file, relative to the case file"},
                        "entry": {"type": "string", "description": "the material's key in the library"},
                    }
                }
            },
            "component": {
                "type": "array", "minItems": 1,
                "items": {
                    "type": "object", "additionalProperties": false,
                    "required": ["id", "type", "material"],
                    "oneOf": joint_one_of,
                    "properties": component_properties
                }
            }
        }
    })
}

/// The schema as pretty JSON text.
pub fn schema_text() -> String {
    serde_json::to_string_pretty(&schema()).unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn starter_file_is_a_valid_acceptable_case() {
        let ev = crate::pipeline::evaluate("starter.toml", STARTER).unwrap();
        assert!(ev.calculation.acceptable());
    }

    #[test]
    fn every_schema_key_of_design_materials_and_stock_is_accepted_by_the_parser() {
        let s = schema();
        for (table, header) in [("design", None), ("stock", Some("[stock]"))] {
            let props = s["properties"][table]["properties"].as_object().unwrap();
            for key in props.keys() {
                let text = match header {
                    None => STARTER.replace("[design]\n", &format!("[design]\n{key} = \"1 mm\"\n")),
                    Some(h) => format!("{STARTER}\n{h}\n{key} = \"1 mm\"\n"),
                };
                let err = crate::case::parse_case("x.toml", &text).err().map(|e| e.render()).unwrap_or_default();
                assert!(!err.contains("unknown field"), "{table}.{key}: {err}");
            }
        }
        let props = s["properties"]["materials"]["additionalProperties"]["properties"].as_object().unwrap();
        for key in props.keys() {
            let text = format!("{STARTER}\n[materials.extra]\n{key} = \"1 mm\"\n");
            let err = crate::case::parse_case("x.toml", &text).err().map(|e| e.render()).unwrap_or_default();
            assert!(!err.contains("unknown field"), "materials.{key}: {err}");
        }
    }

    #[test]
    fn every_schema_component_key_is_accepted_by_the_parser() {
        // A key listed in the schema but unknown to the parser would make the
        // parse fail with "unknown field"; the reverse is covered by the
        // parser's deny_unknown_fields.
        let s = schema();
        let props = s["properties"]["component"]["items"]["properties"].as_object().unwrap();
        for key in props.keys() {
            let text = format!("{STARTER}\n[[component]]\n{key} = \"1 mm\"\n");
            let err = crate::case::parse_case("x.toml", &text).err().map(|e| e.render()).unwrap_or_default();
            assert!(!err.contains("unknown field"), "{key}: {err}");
        }
    }
}
