//! Head properties checked against the open-source Python library `fluids`
//! (Chemical Engineering Design Library), version 1.3.1, module
//! `fluids.geometry`. The literal values below were computed with that
//! library; its argument conventions are: `D` the inside diameter of the
//! cylinder, `a` the head depth, `f` = crown (dish) radius / D and `k` =
//! knuckle radius / D, both as fractions of the same inside D. Volumes of a
//! head alone are the vertical-tank volumes filled exactly to the tangent
//! line, `h = a`. Our unit is mm, so the values are in mm, mm² and mm³.

use knuckle::geometry::{properties, HeadShape, HeadSpec};

fn spec(shape: HeadShape, d: f64) -> HeadSpec {
    HeadSpec { shape, inside_diameter: d, straight_flange: 0.0, thickness: 0.0, density: 7850.0 }
}

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

/// (D, D/2h, V, A): V = fluids.geometry.V_vertical_ellipsoidal(D, a=D/(2·(D/2h)), h=a),
/// A = fluids.geometry.SA_ellipsoidal_head(D, a), fluids 1.3.1.
const ELLIPSOIDAL: [(f64, f64, f64, f64); 20] = [
    (500.0, 1.0, 32724923.47489368, 392699.0816987241),
    (500.0, 1.5, 21816615.649929117, 309030.33809701854),
    (500.0, 2.0, 16362461.73744684, 270996.33447953284),
    (500.0, 2.5, 13089969.389957473, 250055.63650579238),
    (500.0, 3.0, 10908307.824964559, 237139.5374317846),
    (1000.0, 1.0, 261799387.79914945, 1570796.3267948965),
    (1000.0, 1.5, 174532925.19943294, 1236121.3523880742),
    (1000.0, 2.0, 130899693.89957473, 1083985.3379181314),
    (1000.0, 2.5, 104719755.11965978, 1000222.5460231695),
    (1000.0, 3.0, 87266462.59971647, 948558.1497271385),
    (2500.0, 1.0, 4090615434.3617105, 9817477.042468105),
    (2500.0, 1.5, 2727076956.241141, 7725758.452425465),
    (2500.0, 2.0, 2045307717.1808553, 6774908.361988322),
    (2500.0, 2.5, 1636246173.7446842, 6251390.91264481),
    (2500.0, 3.0, 1363538478.1205704, 5928488.435794616),
    (4000.0, 1.0, 16755160819.145565, 25132741.228718344),
    (4000.0, 1.5, 11170107212.763708, 19777941.638209186),
    (4000.0, 2.0, 8377580409.5727825, 17343765.406690102),
    (4000.0, 2.5, 6702064327.658226, 16003560.736370713),
    (4000.0, 3.0, 5585053606.381854, 15176930.395634215),
];

/// (D, f, k, depth, V, A): depth = fluids.geometry.a_torispherical(D, f, k),
/// V = fluids.geometry.V_vertical_torispherical(D, f, k, h=depth),
/// A = fluids.geometry.SA_torispheroidal(D, f, k), fluids 1.3.1.
const TORISPHERICAL: [(f64, f64, f64, f64, f64, f64); 24] = [
    (600.0, 0.9, 0.17, 149.30830569360705, 28693709.20982954, 396006.83650247584),
    (600.0, 1.0, 0.06, 101.60256822491554, 17495784.926888756, 335009.81866340863),
    (600.0, 0.8, 0.1, 135.32624120771825, 23734937.131643288, 365284.9223045456),
    (600.0, 1.0, 0.1, 116.26453510208702, 21376654.945506003, 356395.3571976826),
    (600.0, 0.8, 0.154, 152.68363927233946, 28246694.440703474, 391651.5100696727),
    (600.0, 1.2, 0.3, 193.50213675647265, 39965336.350039236, 462698.24559181754),
    (1200.0, 0.9, 0.17, 298.6166113872141, 229549673.6786363, 1584027.3460099034),
    (1200.0, 1.0, 0.06, 203.2051364498311, 139966279.41511005, 1340039.2746536345),
    (1200.0, 0.8, 0.1, 270.6524824154365, 189879497.0531463, 1461139.6892181823),
    (1200.0, 1.0, 0.1, 232.52907020417405, 171013239.56404802, 1425581.4287907304),
    (1200.0, 0.8, 0.154, 305.3672785446789, 225973555.5256278, 1566606.0402786909),
    (1200.0, 1.2, 0.3, 387.0042735129453, 319722690.8003139, 1850792.9823672702),
    (2500.0, 0.9, 0.17, 622.1179403900294, 2075644474.0906777, 6875118.689279093),
    (2500.0, 1.0, 0.06, 423.3440342704814, 1265609442.0492444, 5816142.685128622),
    (2500.0, 0.8, 0.1, 563.8593383654927, 1716937003.1570666, 6341752.123342805),
    (2500.0, 1.0, 0.1, 484.43556292536266, 1546343673.7200522, 6187419.3957931),
    (2500.0, 0.8, 0.154, 636.1818303014144, 2043308336.2777395, 6799505.383154038),
    (2500.0, 1.2, 0.3, 806.2589031519694, 2891011020.6914964, 8032955.65263572),
    (3600.0, 0.9, 0.17, 895.8498341616421, 6197841189.323176, 14256246.114089128),
    (3600.0, 1.0, 0.06, 609.6154093494932, 3779089544.2079706, 12060353.47188271),
    (3600.0, 0.8, 0.1, 811.9574472463096, 5126746420.43495, 13150257.202963639),
    (3600.0, 1.0, 0.1, 697.5872106125222, 4617357468.229297, 12830232.859116573),
    (3600.0, 0.8, 0.154, 916.1018356340367, 6101285999.19195, 14099454.362508215),
    (3600.0, 1.2, 0.3, 1161.0128205388362, 8632512651.608477, 16657136.84130543),
];

/// (D, V, A): V = fluids.geometry.V_vertical_spherical(D, a=D/2, h=D/2),
/// A = fluids.geometry.SA_ellipsoidal_head(D, a=D/2), fluids 1.3.1.
const HEMISPHERICAL: [(f64, f64, f64); 2] =
    [(300.0, 7068583.470577034, 141371.6694115407), (1500.0, 883572933.8221294, 3534291.735288517)];

/// (D, α in degrees, depth, V, A): depth = (D/2)/tan α,
/// V = fluids.geometry.V_vertical_conical(D, a=depth, h=depth),
/// A = fluids.geometry.SA_conical_head(D, a=depth), fluids 1.3.1.
const CONICAL: [(f64, f64, f64, f64, f64); 6] = [
    (800.0, 30.0, 692.820323027551, 116083159.31098996, 1005309.6491487339),
    (800.0, 45.0, 400.00000000000006, 67020643.27658227, 710861.2701053387),
    (800.0, 60.0, 230.94010767585038, 38694386.43699667, 580415.7965549497),
    (2000.0, 30.0, 1732.0508075688774, 1813799364.234218, 6283185.307179587),
    (2000.0, 45.0, 1000.0000000000001, 1047197551.1965978, 4442882.938158366),
    (2000.0, 60.0, 577.3502691896259, 604599788.0780729, 3627598.728468436),
];

#[test]
fn ellipsoidal_heads_match_fluids() {
    for (d, k, v, a) in ELLIPSOIDAL {
        let s = spec(HeadShape::Ellipsoidal { aspect_ratio: k }, d);
        let p = properties(&s, &s.profile().unwrap()).unwrap();
        assert!(rel(p.inside_depth.value, d / (2.0 * k)) < 1e-12, "D {d} k {k}");
        assert!(rel(p.volume.value, v) < 1e-6, "D {d} k {k}: V {} vs fluids {v}", p.volume.value);
        assert!(rel(p.inside_area.value, a) < 1e-6, "D {d} k {k}: A {} vs fluids {a}", p.inside_area.value);
    }
}

#[test]
fn torispherical_heads_match_fluids() {
    for (d, f, k, depth, v, a) in TORISPHERICAL {
        let s = spec(HeadShape::Torispherical { crown_radius: f * d, knuckle_radius: k * d }, d);
        let p = properties(&s, &s.profile().unwrap()).unwrap();
        assert!(
            rel(p.inside_depth.value, depth) < 1e-6,
            "D {d} f {f} k {k}: h {} vs fluids {depth}",
            p.inside_depth.value
        );
        assert!(rel(p.volume.value, v) < 1e-6, "D {d} f {f} k {k}: V {} vs fluids {v}", p.volume.value);
        assert!(rel(p.inside_area.value, a) < 1e-6, "D {d} f {f} k {k}: A {} vs fluids {a}", p.inside_area.value);
    }
}

#[test]
fn hemispherical_heads_match_fluids() {
    for (d, v, a) in HEMISPHERICAL {
        let s = spec(HeadShape::Hemispherical, d);
        let p = properties(&s, &s.profile().unwrap()).unwrap();
        assert!(rel(p.volume.value, v) < 1e-6, "D {d}: V {} vs fluids {v}", p.volume.value);
        assert!(rel(p.inside_area.value, a) < 1e-6, "D {d}: A {} vs fluids {a}", p.inside_area.value);
    }
}

#[test]
fn conical_heads_match_fluids() {
    for (d, alpha_deg, depth, v, a) in CONICAL {
        let shape = HeadShape::Conical { small_diameter: 0.0, half_apex_angle: alpha_deg.to_radians() };
        let s = spec(shape, d);
        let p = properties(&s, &s.profile().unwrap()).unwrap();
        assert!(rel(p.inside_depth.value, depth) < 1e-9, "D {d} α {alpha_deg}");
        assert!(rel(p.volume.value, v) < 1e-6, "D {d} α {alpha_deg}: V {} vs fluids {v}", p.volume.value);
        assert!(rel(p.inside_area.value, a) < 1e-6, "D {d} α {alpha_deg}: A {} vs fluids {a}", p.inside_area.value);
    }
}
