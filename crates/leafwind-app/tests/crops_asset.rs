//! `assets/crops.ron` is the readable mirror of the engine's built-in crop limits: the two must
//! agree entry for entry (crop, stage, limit, air or tissue, source).

use leafwind_physics::crops::{CROP_HEAT_LIMITS, HeatLimit};

#[test]
fn crops_asset_mirrors_the_built_in_table() {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../../assets/crops.ron");
    let text = std::fs::read_to_string(&path).unwrap();
    let asset: Vec<HeatLimit> = ron::from_str(&text).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(asset.len(), CROP_HEAT_LIMITS.len());
    for (a, b) in asset.iter().zip(CROP_HEAT_LIMITS.iter()) {
        assert_eq!(a, b);
        assert!(
            !a.source.is_empty(),
            "{} {} names no source",
            a.crop,
            a.stage
        );
    }
    // The crops are all there, and a few field crops.
    for crop in [
        "tomato",
        "pepper",
        "cucumber",
        "lettuce",
        "strawberry",
        "wheat",
        "maize",
        "rice",
    ] {
        assert!(asset.iter().any(|l| l.crop == crop), "{crop}");
    }
}
