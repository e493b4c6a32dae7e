"""The NRTL (non-random two-liquid) excess-Gibbs model, multicomponent and vectorized.

For c components with mole fractions x_i, interaction parameters τ_ij (τ_ii = 0) and
non-randomness α_ij = α_ji, with G_ij = exp(−α_ij τ_ij):

    g^E / (R T) = Σ_i x_i (Σ_j x_j τ_ji G_ji) / (Σ_k x_k G_ki)

    ln γ_i = (Σ_j x_j τ_ji G_ji) / (Σ_k x_k G_ki)
             + Σ_j [x_j G_ij / (Σ_k x_k G_kj)] (τ_ij − (Σ_m x_m τ_mj G_mj) / (Σ_k x_k G_kj))

Temperature enters through the parameters, τ_ij = a_ij + b_ij / T (b in K). A binary
parameter set therefore needs only the pair's (a_12, b_12, a_21, b_21, α), and the
multicomponent form needs nothing beyond the binaries, which is why the model is used
here for water + sugars, polyols, glycols, alcohols and their mixtures.

Every function takes arrays with a leading composition axis (shape (N, c)) and works the
same on one composition (N = 1).

References
----------
Renon, H.; Prausnitz, J. M. (1968) AIChE J. 14, 135–144.
Prausnitz, J. M.; Lichtenthaler, R. N.; de Azevedo, E. G. (1999) Molecular
Thermodynamics of Fluid-Phase Equilibria, 3rd ed., §6.11.
"""
from __future__ import annotations

import numpy as np

__all__ = ["tau_of_T", "ln_gamma", "gibbs_excess", "ln_gamma_binary"]


def tau_of_T(a, b, T):
    """Interaction parameters τ_ij = a_ij + b_ij / T.

    a : [1], shape (c, c); b : [K], shape (c, c); T : [K], shape (N,) or scalar.
    Returns τ with shape (N, c, c) (or (c, c) for scalar T).
    """
    T = np.asarray(T, dtype=float)
    a = np.asarray(a, dtype=float)
    b = np.asarray(b, dtype=float)
    return a + b / T[..., None, None]


def _sums(x, tau, alpha):
    """Normalised x, τ, G and the sums Σ_k x_k G_kj and (Σ_k x_k τ_kj G_kj) / (Σ_k x_k G_kj)
    shared by ln γ and g^E."""
    x = np.atleast_2d(np.asarray(x, dtype=float))
    x = x / x.sum(axis=-1, keepdims=True)
    tau = np.asarray(tau, dtype=float)
    G = np.exp(-np.asarray(alpha, dtype=float) * tau)
    shape = x.shape[:-1] + G.shape[-2:]
    den = np.einsum("...k,...kj->...j", x, np.broadcast_to(G, shape))
    num = np.einsum("...k,...kj->...j", x, np.broadcast_to(tau * G, shape))
    return x, tau, G, den, num / den


def ln_gamma(x, tau, alpha):
    """ln γ_i of every component [1], shape (N, c).

    x : mole fractions [1], shape (N, c) (rows need not be normalised: they are)
    tau : τ_ij [1], shape (N, c, c) or (c, c)
    alpha : α_ij [1], shape (c, c) or (N, c, c), symmetric

    >>> # a symmetric binary at x1 = 0.5 with τ12 = τ21 = 1, α = 0.3 (hand calculation:
    >>> # G = e^-0.3, ln γ = 0.25 (τ G² / (0.5 + 0.5 G)² + τ G / (0.5 + 0.5 G)²))
    >>> g = ln_gamma([[0.5, 0.5]], [[0.0, 1.0], [1.0, 0.0]], [[0, 0.3], [0.3, 0]])
    >>> round(float(g[0, 0]), 6), round(float(g[0, 1]), 6)
    (0.425557, 0.425557)
    """
    x, tau, G, den, r = _sums(x, tau, alpha)        # r (N, c): the first term, indexed by j
    inner = G * (tau - r[..., None, :])             # (N, c, c): G_ij (τ_ij − r_j)
    return r + np.einsum("...j,...ij->...i", x / den, inner)


def gibbs_excess(x, tau, alpha):
    """g^E / (R T) [1], shape (N,): Σ_i x_i ln γ_i's first term (the model's definition)."""
    x, _, _, _, r = _sums(x, tau, alpha)
    return np.sum(x * r, axis=-1)


def ln_gamma_binary(x1, tau12, tau21, alpha):
    """ln γ1, ln γ2 of a binary [1] (the closed form; vectorized over any shapes).

    x1 : mole fraction of component 1 [1]; tau12, tau21 : [1]; alpha : [1].
    """
    x1 = np.asarray(x1, dtype=float)
    x2 = 1.0 - x1
    G12 = np.exp(-alpha * tau12)
    G21 = np.exp(-alpha * tau21)
    d1 = x1 + x2 * G21
    d2 = x2 + x1 * G12
    lg1 = x2 ** 2 * (tau21 * (G21 / d1) ** 2 + tau12 * G12 / d2 ** 2)
    lg2 = x1 ** 2 * (tau12 * (G12 / d2) ** 2 + tau21 * G21 / d1 ** 2)
    return lg1, lg2
