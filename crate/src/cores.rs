//! Work spread over the machine's cores natively (rayon) and done in turn in the page's wasm
//! build, which has one thread. Results are always in input order, so no output depends on
//! the number of threads.

/// `f` of every item of `items`, in order.
///
/// ```
/// assert_eq!(catchwalk::cores::map(&[1, 2, 3], |x| x * 10), vec![10, 20, 30]);
/// ```
pub fn map<A, T, F>(items: &[A], f: F) -> Vec<T>
where
    A: Sync,
    T: Send,
    F: Fn(&A) -> T + Sync + Send,
{
    #[cfg(not(target_arch = "wasm32"))]
    {
        use rayon::prelude::*;
        items.par_iter().map(f).collect()
    }
    #[cfg(target_arch = "wasm32")]
    {
        items.iter().map(f).collect()
    }
}

/// `f(i)` for every `i` in `0..n`, in order.
///
/// ```
/// assert_eq!(catchwalk::cores::map_range(4, |i| i * i), vec![0, 1, 4, 9]);
/// ```
pub fn map_range<T, F>(n: usize, f: F) -> Vec<T>
where
    T: Send,
    F: Fn(usize) -> T + Sync + Send,
{
    #[cfg(not(target_arch = "wasm32"))]
    {
        use rayon::prelude::*;
        (0..n).into_par_iter().map(f).collect()
    }
    #[cfg(target_arch = "wasm32")]
    {
        (0..n).map(f).collect()
    }
}

/// `a()` and `b()`, side by side natively.
///
/// ```
/// assert_eq!(catchwalk::cores::join(|| 1, || "two"), (1, "two"));
/// ```
pub fn join<A, B, RA, RB>(a: A, b: B) -> (RA, RB)
where
    A: FnOnce() -> RA + Send,
    B: FnOnce() -> RB + Send,
    RA: Send,
    RB: Send,
{
    #[cfg(not(target_arch = "wasm32"))]
    {
        rayon::join(a, b)
    }
    #[cfg(target_arch = "wasm32")]
    {
        (a(), b())
    }
}
