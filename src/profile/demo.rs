//! The invented demo fleet from the repository's `profiles/`, embedded in the binary so that
//! the first run works with no set-up. Read-only; `tidewright init` copies it into the store.

/// Demo boats: (profile name, file text).
pub const BOATS: &[(&str, &str)] = &[
    ("marram", include_str!("../../profiles/boats/marram.toml")),
    ("pintle", include_str!("../../profiles/boats/pintle.toml")),
    ("sorrel", include_str!("../../profiles/boats/sorrel.toml")),
];

/// Demo engine sheets: (profile name, file text).
pub const ENGINES: &[(&str, &str)] = &[
    (
        "brindmoor-3b40",
        include_str!("../../profiles/engines/brindmoor-3b40.toml"),
    ),
    (
        "brindmoor-4b62",
        include_str!("../../profiles/engines/brindmoor-4b62.toml"),
    ),
    (
        "quellan-qd90",
        include_str!("../../profiles/engines/quellan-qd90.toml"),
    ),
];

/// The text of demo boat `name`.
pub fn boat(name: &str) -> Option<&'static str> {
    BOATS.iter().find(|(n, _)| *n == name).map(|(_, t)| *t)
}

/// The text of demo engine sheet `name`.
pub fn engine(name: &str) -> Option<&'static str> {
    ENGINES.iter().find(|(n, _)| *n == name).map(|(_, t)| *t)
}

/// Names of the demo boats, sorted.
pub fn boat_names() -> Vec<&'static str> {
    BOATS.iter().map(|(n, _)| *n).collect()
}

/// Names of the demo engine sheets, sorted.
pub fn engine_names() -> Vec<&'static str> {
    ENGINES.iter().map(|(n, _)| *n).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_embedded_lists_match_the_profiles_folder() {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("profiles");
        for (sub, names) in [("boats", boat_names()), ("engines", engine_names())] {
            let mut on_disk: Vec<String> = std::fs::read_dir(dir.join(sub))
                .unwrap()
                .map(|e| e.unwrap().path())
                .filter(|p| p.extension().is_some_and(|x| x == "toml"))
                .map(|p| p.file_stem().unwrap().to_string_lossy().into_owned())
                .collect();
            on_disk.sort();
            assert_eq!(
                on_disk, names,
                "profiles/{sub} and the embedded list differ"
            );
        }
    }
}
