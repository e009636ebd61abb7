fn main() {
    println!("tonewright {}", env!("CARGO_PKG_VERSION"));
}
