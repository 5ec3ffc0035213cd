//! Names the build's commit for `tidewright --version` when the source is a git checkout.

use std::process::Command;

fn main() {
    // A tarball or crates.io source has no git: the version then stands alone, silently.
    let commit = Command::new("git")
        .args(["rev-parse", "--short=10", "HEAD"])
        .output()
        .ok()
        .filter(|out| out.status.success())
        .and_then(|out| String::from_utf8(out.stdout).ok())
        .map(|text| text.trim().to_owned())
        .filter(|text| !text.is_empty() && text.bytes().all(|b| b.is_ascii_hexdigit()));
    if let Some(commit) = commit {
        println!("cargo:rustc-env=TIDEWRIGHT_COMMIT={commit}");
    }
    // Rebuild when HEAD moves (a commit or a checkout), not on every file change.
    if let Some(git_dir) = Command::new("git")
        .args(["rev-parse", "--git-dir"])
        .output()
        .ok()
        .filter(|out| out.status.success())
        .and_then(|out| String::from_utf8(out.stdout).ok())
    {
        let git_dir = std::path::PathBuf::from(git_dir.trim());
        println!("cargo:rerun-if-changed={}", git_dir.join("HEAD").display());
        println!(
            "cargo:rerun-if-changed={}",
            git_dir.join("logs/HEAD").display()
        );
    }
    println!("cargo:rerun-if-changed=build.rs");
}
