//! wasm-bindgen surface for the page's worker: converts and forwards, no logic.
