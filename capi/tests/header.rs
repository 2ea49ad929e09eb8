//! The committed header is what cbindgen generates from the crate today, byte for byte; and it
//! compiles as C99 and C11 with every warning an error. `KICKGUARD_BLESS=1` rewrites it.

use std::path::PathBuf;
use std::process::Command;

fn crate_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn generate() -> String {
    let dir = crate_dir();
    let config = cbindgen::Config::from_file(dir.join("cbindgen.toml")).unwrap();
    let mut out = Vec::new();
    cbindgen::Builder::new()
        .with_crate(&dir)
        .with_config(config)
        .generate()
        .unwrap()
        .write(&mut out);
    String::from_utf8(out).unwrap()
}

#[test]
fn header_is_current() {
    let path = crate_dir().join("include/kickguard.h");
    let fresh = generate();
    if std::env::var_os("KICKGUARD_BLESS").is_some() {
        std::fs::write(&path, &fresh).unwrap();
    }
    let committed = std::fs::read_to_string(&path).unwrap();
    assert!(committed == fresh, "include/kickguard.h is stale: KICKGUARD_BLESS=1 cargo test -p kickguard-capi --test header");
}

#[test]
fn header_compiles_as_c99_and_c11() {
    let header = crate_dir().join("include/kickguard.h");
    for std in ["c99", "c11"] {
        let out = Command::new("cc")
            .args([
                &format!("-std={std}"),
                "-Wall",
                "-Wextra",
                "-pedantic",
                "-Werror",
                "-fsyntax-only",
                "-x",
                "c",
            ])
            .arg(&header)
            .output()
            .expect("a C compiler (cc)");
        assert!(
            out.status.success(),
            "{std}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
    }
}
