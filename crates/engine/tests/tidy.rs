//! The engine stays pure Rust with no web dependency, so it builds and
//! tests natively and the browser layer stays in the app crate.

/// Crates that belong to the browser layer, never to the engine.
const WEB_CRATES: &[&str] = &[
    "leptos",
    "wasm-bindgen",
    "web-sys",
    "js-sys",
    "gloo",
    "serde-wasm-bindgen",
    "tachys",
    "reactive_graph",
];

/// True for a section that lists what the library links: `[dependencies]`,
/// `[build-dependencies]`, `[target.'cfg(..)'.dependencies]`, and the
/// `[dependencies.NAME]` table form. Not dev-dependencies.
fn linked_section(header: &str) -> bool {
    let h = header.trim_matches(|c| c == '[' || c == ']').trim();
    let last = h.rsplit('.').next().unwrap_or(h);
    let is_deps = |s: &str| s == "dependencies" || s == "build-dependencies";
    is_deps(h)
        || is_deps(last)
        || h.starts_with("dependencies.")
        || h.contains(".dependencies.")
        || h.starts_with("build-dependencies.")
}

/// The crate names a manifest links, with the line they are on. Handles
/// `name = ...`, `[dependencies.name]` and `package = "name"` renames.
fn linked_crates(manifest: &str) -> Vec<(usize, String)> {
    let mut out = Vec::new();
    let mut in_linked = false;
    for (i, raw) in manifest.lines().enumerate() {
        let line = raw.split('#').next().unwrap_or("").trim();
        if line.starts_with('[') {
            in_linked = linked_section(line);
            let h = line.trim_matches(|c| c == '[' || c == ']');
            if in_linked {
                if let Some((_, name)) = h.rsplit_once("dependencies.") {
                    out.push((i + 1, name.trim_matches('"').to_string()));
                }
            }
            continue;
        }
        if !in_linked || line.is_empty() {
            continue;
        }
        if let Some((key, value)) = line.split_once('=') {
            let key = key.trim().trim_matches('"');
            if key == "package" {
                out.push((i + 1, value.trim().trim_matches('"').to_string()));
            } else {
                out.push((i + 1, key.to_string()));
                if let Some((_, rest)) = value.split_once("package") {
                    if let Some(name) = rest.split('"').nth(1) {
                        out.push((i + 1, name.to_string()));
                    }
                }
            }
        }
    }
    out
}

fn web_crates_in(manifest: &str) -> Vec<String> {
    linked_crates(manifest)
        .into_iter()
        .filter(|(_, name)| {
            let n = name.replace('_', "-");
            WEB_CRATES.iter().any(|w| w.replace('_', "-") == n)
        })
        .map(|(line, name)| format!("line {line}: {name}"))
        .collect()
}

#[test]
fn engine_links_no_web_crate() {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/Cargo.toml");
    let manifest = std::fs::read_to_string(path).expect("engine manifest readable");
    let found = web_crates_in(&manifest);
    assert!(
        found.is_empty(),
        "crates/engine/Cargo.toml links web crates: {found:?}. The engine must stay pure Rust; \
         put browser code in the app crate."
    );
    // The check sees the dependencies it is meant to see.
    let names: Vec<String> = linked_crates(&manifest)
        .into_iter()
        .map(|(_, n)| n)
        .collect();
    assert!(
        names.iter().any(|n| n == "serde"),
        "parser missed serde in {names:?}"
    );
}

#[test]
fn the_check_catches_each_form() {
    let plain = "[package]\nname = \"x\"\n[dependencies]\nserde = \"1\"\nleptos = { version = \"0.8\" }\n";
    assert_eq!(web_crates_in(plain), ["line 5: leptos"]);
    let table = "[dependencies.wasm-bindgen]\nversion = \"0.2\"\n";
    assert_eq!(web_crates_in(table), ["line 1: wasm-bindgen"]);
    let target =
        "[target.'cfg(target_arch = \"wasm32\")'.dependencies]\nweb-sys = \"0.3\"\n";
    assert_eq!(web_crates_in(target), ["line 2: web-sys"]);
    let renamed =
        "[dependencies]\nui = { package = \"reactive_graph\", version = \"0.2\" }\n";
    assert_eq!(web_crates_in(renamed), ["line 2: reactive_graph"]);
    let dev_only = "[dev-dependencies]\nwasm-bindgen-test = \"0.3\"\njs-sys = \"0.3\"\n";
    assert!(web_crates_in(dev_only).is_empty());
    let commented = "[dependencies]\n# gloo = \"0.11\"\nserde = \"1\"\n";
    assert!(web_crates_in(commented).is_empty());
}
