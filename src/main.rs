//! The `tinct` binary: a thin shell over the library.

fn main() {
    println!("tinct");
}
