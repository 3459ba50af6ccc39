//! Mounts the Kneepoint app; everything else lives in the library.
fn main() {
    kneepoint::app::start();
}
