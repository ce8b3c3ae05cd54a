//! catchwalk: audits children's walking routes to school.
//!
//! Data flows one way, each stage a plain function over plain data:
//! layers ([`input`]) -> pedestrian graph ([`network`]) -> route trees ([`route`])
//! -> route audits ([`audit`]) -> scores ([`score`]) -> exports ([`export`]).
//! The CLI (`bin/catchwalk.rs`) and the wasm bindings (`wasm.rs`) only convert and forward.
//!
//! This is a screening tool for planning: it does not replace a site assessment,
//! engineering judgement, local design codes or a licensed traffic engineer.

pub mod audit;
pub mod benefit;
pub mod compare;
pub mod config;
pub mod cores;
pub mod error;
pub mod export;
pub mod facts;
pub mod geodesy;
pub mod input;
pub mod network;
pub mod pipeline;
pub mod project;
pub mod range;
pub mod risk;
pub mod route;
pub mod scenario;
pub mod score;

#[cfg(target_arch = "wasm32")]
pub mod wasm;

/// The caution every result, export and report carries.
pub const CAUTION: &str = "Screening tool for planning only: it does not replace a site \
assessment, engineering judgement, local design codes or a licensed traffic engineer. \
Verify every route on the ground before advising families.";
