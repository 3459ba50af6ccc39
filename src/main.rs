//! Mounts the Kneepoint app.
fn main() {}
