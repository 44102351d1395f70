"""The equation model of one column configuration: stages, sizes and costs, TAC as objective.

For a fixed number of stages N (reboiler included) and feed stage NF the model holds the
component balances, equilibrium from the fitted forms, summation, constant molar overflow
or stage energy balances, the condenser and reboiler duties, the product specifications,
the column diameter from flooding at every tray, the exchanger areas and the total
annualised cost. Reflux ratio and distillate flow are the continuous decisions.

Sizes and costs are not written here: flooding, tray area, mean temperature difference and
area, drum, pump, cost curves with their installed-cost factors, utility cost and TAC are
the sizing and costing layers' functions, evaluated over Pyomo's operations (:data:`PYOMO`)
with the options the basis carries (flooding fit, tray type, materials).

Scaling: enthalpies in kJ/mol so duties are in kW; the objective is TAC in thousands of
currency per year.
"""

from __future__ import annotations

import pyomo.environ as pyo

from .._base.operations import Operations
from ..costing.annual import total_annualised_cost
from ..costing.operating import yearly_cost
from ..sizing.auxiliaries import drum_volume, pump_shaft_power
from ..sizing.exchangers import exchanger_area, mean_temperature_difference, terminal_differences, terminal_pairs
from ..sizing.flooding import allowable_vapour_velocity, diameter_of, flow_parameter, required_tray_area, tray_area
from .basis import CostBasis, SeparationProblem
from .fitted_sizing import liquid_density, vapour_density
from .options import model_options
from .start import Profile, partial_condenser_split

FRACTION_SLACK = 1.0  # how far beyond [0, 1] a mole fraction's redundant bound lies [-]
PYOMO = Operations(pyo.exp, pyo.log, pyo.sqrt)
KILO = 1e3
TAC_SCALE = 1e3  # objective in thousands of currency per year
FLOW_FLOOR = 1e-4  # fraction of the feed kept as the smallest internal flow (keeps F_LV**c3 smooth)


def build_column_model(problem: SeparationProblem, basis: CostBasis, stages: int, feed_stage: int,
                       options=None) -> pyo.ConcreteModel:
    """Build the model of one configuration (``stages`` incl. reboiler, ``feed_stage`` from the top)."""
    config = model_options(options)
    if not 2 <= feed_stage <= stages - 1:
        raise ValueError(f"feed stage {feed_stage} must lie between 2 and {stages - 1} for {stages} stages")
    m = pyo.ConcreteModel(name=f"column N={stages} NF={feed_stage}")
    m.config = config
    m.problem, m.basis = problem, basis
    m.N, m.NF = stages, feed_stage
    _add_stages(m)
    _add_duties(m)
    _add_specs(m)
    _add_sizing(m)
    _add_costs(m)
    _add_throughput_scaling(m)
    return m


# The feeds the solver's options and limits were measured on: the examples and test cases, 40-300 kmol/h [mol/s].
MEASURED_FEEDS = (40.0 / 3.6, 300.0 / 3.6)


def throughput_scale(feed_flow: float) -> float:
    """Factor on the flows and duties the solver sees [-]: one for a feed in :data:`MEASURED_FEEDS`, else the
    factor that brings the feed to the nearer end of that range."""
    low, high = MEASURED_FEEDS
    return min(max(feed_flow, low), high) / feed_flow


def _add_throughput_scaling(m) -> None:
    """Scaling factors the solver reads with the model (the .nl file's ``scaling_factor`` suffix) on the
    flows and duties of a feed outside :data:`MEASURED_FEEDS`, so that it sees a column of a measured size.

    Measured: the depentaniser example at 20 x its feed (1900 kmol/h) took 1.4-4.7 s per configuration
    and failed some from their warm starts (iterate to 1.7e4 kW, dual infeasibility stuck at 1.4e8);
    scaled to 300 kmol/h, 0.09-0.18 s each, the same TACs. Scaled by 1/F inside that range as well, the
    twenty-component debutaniser (200 kmol/h, 17 stages, feed on 8) failed where it solves unscaled in 0.8 s.
    """
    scale = throughput_scale(m.problem.feed_flow)
    if scale == 1.0:
        return
    m.scaling_factor = pyo.Suffix(direction=pyo.Suffix.EXPORT)
    for flow in (*m.L.values(), *m.V.values(), m.D, m.Qc, m.Qr):
        m.scaling_factor[flow] = scale


# ------------------------------------------------------------------ stages


def _add_stages(m) -> None:
    p, f, config = m.problem, m.problem.fitted, m.config
    F = p.feed_flow
    flow_max = (config.reflux_max + 1.0) * F + F
    m.C = pyo.RangeSet(0, f.size - 1)
    m.J = pyo.RangeSet(1, m.N)
    m.R = pyo.Var(bounds=(config.reflux_min, config.reflux_max),  # a control margin can raise the lower bound
                  initialize=min(max(1.0, config.reflux_min), config.reflux_max), doc="reflux ratio [-]")
    m.D = pyo.Var(bounds=(FLOW_FLOOR * F, F * (1 - FLOW_FLOOR)), initialize=0.5 * F, doc="distillate [mol/s]")
    m.T = pyo.Var(m.J, bounds=(f.T_low, f.T_high), initialize=0.5 * (f.T_low + f.T_high), doc="[K]")
    m.TD = pyo.Var(bounds=(f.T_low, f.T_high), initialize=f.T_low, doc="distillate bubble point [K]")
    # Mole fractions are held in [0, 1] by bounds only where nothing else holds them. With positive
    # flows and K values the component balances give x > 0 and sum(x) = 1 gives x <= 1; y = K x
    # with sum(y) = sum(x) holds y, except the top vapour of a total condenser, which is also the
    # distillate liquid. A redundant bound that a trace fraction reaches jams the interior point:
    # measured on the 25-bar deethaniser (partial condenser), n-butane's top vapour fraction sat
    # on its bound at 0 while equilibrium asked 3e-6, and 9 of 15 configurations stalled
    # (restoration failed, or 300 iterations in 4-5 s); with the redundant bounds moved out of
    # reach all 15 solved in 0.14-0.35 s from either start and strategy. They stay finite
    # (FRACTION_SLACK beyond [0, 1]) for a global solver's relaxations. The same held for x >= 0 on
    # a far over-staged column: benzene-toluene at R 2 on 200 stages has toluene at 4e-21 in the
    # distillate, and against the bound ripopt stalled from every start (exit 1); unbounded below it
    # solved in 15 iterations, 0.7 s, every x positive. x enters only the NRTL sums and the K fit's
    # linear terms, which a trace below zero keeps finite.
    m.x = pyo.Var(m.J, m.C, bounds=(-FRACTION_SLACK, 1.0 + FRACTION_SLACK), initialize=1.0 / f.size)
    m.y = pyo.Var(m.J, m.C, bounds=_vapour_bounds(p), initialize=1.0 / f.size)
    m.L = pyo.Var(m.J, bounds=(FLOW_FLOOR * F, flow_max), initialize=F, doc="liquid leaving [mol/s]")
    m.V = pyo.Var(m.J, bounds=(FLOW_FLOOR * F, flow_max), initialize=F, doc="vapour leaving [mol/s]")
    m.P = {j: p.pressure(j) for j in m.J}
    m.reflux = pyo.Expression(expr=m.R * m.D)
    if p.partial_condenser:
        _add_partial_condenser(m)

    ln_k = {}  # a stage's ln K of every component built at once (built per component: 5 x the work for 5)

    def ln_k_of(j, i):
        if j not in ln_k:
            ln_k[j] = f.ln_k(m.T[j], m.P[j], [m.x[j, c] for c in m.C], exp=pyo.exp, log=pyo.log)
        return ln_k[j][i]

    m.lnK = pyo.Expression(m.J, m.C, rule=lambda m, j, i: ln_k_of(j, i))
    m.equilibrium = pyo.Constraint(m.J, m.C, rule=equilibrium_rule)
    m.summation = pyo.Constraint(m.J, rule=summation_rule)
    m.component_balance = pyo.Constraint(m.J, m.C, rule=component_balance_rule)
    if not p.partial_condenser:
        # A partial condenser's component balances with both summations already give
        # V1 = (R + 1) D; stated again, the redundant equation left ripopt a singular Jacobian
        # (measured: a six-component debutaniser, 8 bar, 0 of 12 configurations solved, 6 of 6
        # from the adaptive strategy in 0.3-0.7 s without it).
        m.condenser_balance = pyo.Constraint(expr=m.V[1] == (m.R + 1.0) * m.D)
        lnk_d = f.ln_k(m.TD, p.top_pressure, [m.y[1, i] for i in m.C], exp=pyo.exp, log=pyo.log)
        m.distillate_bubble = pyo.Constraint(expr=sum(m.y[1, i] * pyo.exp(lnk_d[i]) for i in m.C) == 1.0)
    m.hL = pyo.Expression(m.J, rule=lambda m, j: f.liquid_enthalpy_of(m.T[j], [m.x[j, i] for i in m.C]) / KILO)
    m.hV = pyo.Expression(m.J, rule=lambda m, j: f.vapour_enthalpy_of(m.T[j], [m.y[j, i] for i in m.C]) / KILO)
    m.h_reflux = pyo.Expression(
        expr=f.liquid_enthalpy_of(m.TD - p.subcooling, [reflux_x(m, i) for i in m.C]) / KILO)
    m.h_distillate = pyo.Expression(
        expr=f.vapour_enthalpy_of(m.TD, [distillate_y(m, i) for i in m.C]) / KILO if p.partial_condenser
        else m.h_reflux)
    m.h_feed = p.feed_enthalpy() / KILO
    m.Qr = pyo.Var(bounds=(0.0, flow_max * _latent_bound(f)), initialize=1.0, doc="reboiler duty [kW]")
    m.Qc = pyo.Var(bounds=(0.0, flow_max * _latent_bound(f)), initialize=1.0, doc="condenser duty [kW]")
    m.sum_x = pyo.Constraint(m.J, rule=lambda m, j: sum(m.x[j, i] for i in m.C) == 1.0)
    if config.energy_balances:
        m.energy_balance = pyo.Constraint(m.J, rule=energy_balance_rule)
    else:
        m.cmo_balance = pyo.Constraint(m.J, rule=cmo_balance_rule)
        m.reboiler_duty = pyo.Constraint(expr=m.Qr == m.V[m.N] * (m.hV[m.N] - m.hL[m.N]))


def _add_partial_condenser(m) -> None:
    """The condenser as an equilibrium contact at TD: vapour distillate yD over liquid reflux xD."""
    p, f = m.problem, m.problem.fitted
    m.xD = pyo.Var(m.C, bounds=(0.0, 1.0 + FRACTION_SLACK), initialize=1.0 / f.size, doc="reflux liquid [-]")
    m.yD = pyo.Var(m.C, bounds=(-FRACTION_SLACK, 1.0 + FRACTION_SLACK), initialize=1.0 / f.size,
                   doc="distillate vapour [-]; held in [0, 1] by equilibrium, as y")
    lnk = f.ln_k(m.TD, p.top_pressure, [m.xD[i] for i in m.C], exp=pyo.exp, log=pyo.log)
    m.condenser_equilibrium = pyo.Constraint(m.C, rule=lambda m, i: m.yD[i] == pyo.exp(lnk[i]) * m.xD[i])
    m.condenser_sum_x = pyo.Constraint(expr=sum(m.xD[i] for i in m.C) == 1.0)
    m.condenser_summation = pyo.Constraint(expr=sum(m.yD[i] - m.xD[i] for i in m.C) == 0.0)
    m.condenser_component = pyo.Constraint(
        m.C, rule=lambda m, i: m.V[1] * m.y[1, i] == m.D * m.yD[i] + m.reflux * m.xD[i])


def _vapour_bounds(problem):
    """Bounds of the stage vapour fractions: out of reach, but the total condenser's top vapour
    (the distillate liquid, inside the activity terms of its bubble point) stays at or above zero."""
    loose = (-FRACTION_SLACK, 1.0 + FRACTION_SLACK)
    if problem.partial_condenser:
        return loose
    return lambda m, j, i: (0.0, loose[1]) if j == 1 else loose


def reflux_x(m, i):
    """Reflux composition: the condenser liquid (partial) or the top vapour condensed (total)."""
    return m.xD[i] if m.problem.partial_condenser else m.y[1, i]


def distillate_y(m, i):
    """Distillate composition: the condenser vapour (partial) or the top vapour condensed (total)."""
    return m.yD[i] if m.problem.partial_condenser else m.y[1, i]


def _latent_bound(fitted) -> float:
    """A generous upper bound on a molar latent heat over the fitted range [kJ/mol]."""
    return 3.0 * max(fitted.vapour_enthalpy[i][0] - fitted.liquid_enthalpy[i][0] for i in range(fitted.size)) / KILO


def equilibrium_rule(m, j, i):
    """y_ji = K_ji x_ji with K from the fitted forms."""
    return m.y[j, i] == pyo.exp(m.lnK[j, i]) * m.x[j, i]


def summation_rule(m, j):
    """sum(y) = sum(x) on every stage; with sum(x) = 1 both sums are one.

    Measured: with sum(y) = 1 in its place, ripopt needed more than 20 s (time limit) on
    the five-component constant-molar-overflow column at 25 stages; with this form 0.6 s.
    """
    return sum(m.y[j, i] - m.x[j, i] for i in m.C) == 0.0


def _liquid_in(m, j, i):
    return m.reflux * reflux_x(m, i) if j == 1 else m.L[j - 1] * m.x[j - 1, i]


def component_balance_rule(m, j, i):
    """In = out for component i on stage j (the reflux enters stage 1)."""
    vapour_in = m.V[j + 1] * m.y[j + 1, i] if j < m.N else 0.0
    feed = m.problem.feed_flow * m.problem.z[i] if j == m.NF else 0.0
    return _liquid_in(m, j, i) + vapour_in + feed == m.L[j] * m.x[j, i] + m.V[j] * m.y[j, i]


def energy_balance_rule(m, j):
    """Stage enthalpy balance [kW]; the reboiler (stage N) receives Qr."""
    liquid_in = m.reflux * m.h_reflux if j == 1 else m.L[j - 1] * m.hL[j - 1]
    vapour_in = m.V[j + 1] * m.hV[j + 1] if j < m.N else 0.0
    feed = m.problem.feed_flow * m.h_feed if j == m.NF else 0.0
    duty = m.Qr if j == m.N else 0.0
    return liquid_in + vapour_in + feed + duty == m.L[j] * m.hL[j] + m.V[j] * m.hV[j]


def cmo_balance_rule(m, j):
    """Constant molar overflow as an enthalpy balance with liquid at zero and vapour at one latent heat.

    The vapour leaving a stage equals the vapour entering it plus the feed's vapour part;
    the liquid flows follow from the component balances. Written this way (rather than as
    explicit L and V equations) the model has the same structure as with energy balances.
    Measured: the explicit form stalled ripopt at 300 iterations on several configurations
    of the five-component example (e.g. 24 stages, feed on 14); this form solves them.
    The reboiler stage has no such balance: its duty is defined from the fitted enthalpies.
    """
    if j == m.N:
        return pyo.Constraint.Skip
    feed_vapour = (1.0 - m.problem.q) * m.problem.feed_flow if j == m.NF else 0.0
    return m.V[j + 1] + feed_vapour == m.V[j]


def _add_duties(m) -> None:
    m.condenser_duty = pyo.Constraint(
        expr=m.Qc == m.V[1] * m.hV[1] - m.reflux * m.h_reflux - m.D * m.h_distillate)


# ------------------------------------------------------------------ product specifications


def _add_specs(m) -> None:
    """Product specifications, each with a relative shortfall variable priced in the objective.

    An exact penalty: at a configuration that can meet the specifications the shortfalls
    are zero; at one that cannot, the solver ends quickly with a positive shortfall instead
    of searching its whole time limit for a feasible point (measured: 9 s at the time
    limit without the shortfalls for 8 stages of the benzene-toluene example).
    """
    p = m.problem
    F, z = p.feed_flow, p.z
    lk, hk = p.light_key, p.heavy_key
    B = m.L[m.N]
    m.shortfall = pyo.Var(["light key", "heavy key"], bounds=(0.0, 1.0), initialize=0.0,
                          doc="relative shortfall of each product specification [-]")
    spec = p.light_key_spec
    if spec.kind == "recovery":
        m.light_key_spec = pyo.Constraint(
            expr=m.D * distillate_y(m, lk) >= spec.value * F * z[lk] * (1.0 - m.shortfall["light key"]))
    else:
        m.light_key_spec = pyo.Constraint(expr=m.x[m.N, lk] <= spec.value * (1.0 + m.shortfall["light key"]))
    spec = p.heavy_key_spec
    if spec.kind == "recovery":
        m.heavy_key_spec = pyo.Constraint(
            expr=B * m.x[m.N, hk] >= spec.value * F * z[hk] * (1.0 - m.shortfall["heavy key"]))
    else:
        m.heavy_key_spec = pyo.Constraint(expr=distillate_y(m, hk) <= spec.value * (1.0 + m.shortfall["heavy key"]))


def shortfall(m) -> float:
    """Largest relative shortfall of a product specification at the current point [-]."""
    return max(pyo.value(m.shortfall[k]) for k in m.shortfall)


APPROACH_HELD = 0.01  # K within the minimum approach at which an exchanger end counts as holding the solution


def held_ends(m) -> tuple[tuple[str, float], ...]:
    """(exchanger, utility temperature [K] at that end) of each exchanger end (as :func:`terminal_pairs`
    pairs them) at its minimum approach at the current point."""
    held = []
    for name, side, inlet, outlet, _ in _exchanger_sides(m):
        pairs = terminal_pairs(side.service, inlet, outlet, side.utility_in, side.utility_out)
        held += [(name, utility) for end, (_, utility) in enumerate(pairs)
                 if pyo.value(m.approach[name, end].body) - pyo.value(m.approach[name, end].lower) < APPROACH_HELD]
    return tuple(held)


# ------------------------------------------------------------------ sizing


def _add_sizing(m) -> None:
    f, trays = m.problem.fitted, m.basis.trays
    m.TRAYS = pyo.RangeSet(1, m.N - 1)
    m.real_trays = trays.real_trays(m.N)
    m.height = trays.height(m.N)
    # the height-to-diameter limit as the diameter's lower bound: a configuration's height is fixed
    least = max(trays.diameter_min, trays.least_diameter(m.N))
    m.diameter = pyo.Var(bounds=(least, trays.diameter_max), initialize=max(1.0, least), doc="[m]")
    m.rho_V = pyo.Expression(m.TRAYS, rule=lambda m, j: vapour_density(m.P[j], m.T[j], _molar_mass(m, m.y, j)))
    m.rho_L = pyo.Expression(m.TRAYS, rule=lambda m, j: liquid_density(f, m.T[j], [m.x[j, i] for i in m.C]))
    m.vapour_volume = pyo.Expression(m.TRAYS, rule=lambda m, j: m.V[j] * _molar_mass(m, m.y, j) / m.rho_V[j],
                                     doc="[m^3/s]")
    m.flow_parameter = pyo.Expression(m.TRAYS, rule=lambda m, j: flow_parameter(
        m.L[j] * _molar_mass(m, m.x, j), m.V[j] * _molar_mass(m, m.y, j), m.rho_L[j], m.rho_V[j]), doc="F_LV [-]")
    m.allowable_velocity = pyo.Expression(m.TRAYS, rule=allowable_velocity_rule,
                                          doc="vapour velocity on the cross-section at the design approach to flood [m/s]")
    m.required_area = pyo.Expression(m.TRAYS, rule=lambda m, j: m.vapour_volume[j] / m.allowable_velocity[j],
                                     doc="tray cross-section flooding needs [m^2]")
    m.tray_area = pyo.Expression(expr=tray_area(m.diameter))
    # area x velocity >= volume flow rather than area >= required area: no division in the constraint
    m.flooding = pyo.Constraint(m.TRAYS, rule=lambda m, j: m.tray_area * m.allowable_velocity[j] >= m.vapour_volume[j])


def _molar_mass(m, fractions, j):
    return m.problem.fitted.molar_mass([fractions[j, i] for i in m.C])


def allowable_velocity_rule(m, j):
    """Allowable vapour velocity of tray j at the design approach to flood: the sizing layer's function."""
    trays, f = m.basis.trays, m.problem.fitted
    return allowable_vapour_velocity(
        m.flow_parameter[j], m.rho_L[j], m.rho_V[j], f.surface_tension_of(m.T[j], [m.x[j, i] for i in m.C]),
        trays.tray_spacing, trays.flooding_fraction, trays.flooding_method, trays.system_factor,
        trays.downcomer_fraction, PYOMO)


# ------------------------------------------------------------------ costs


def _exchanger_sides(m) -> tuple:
    """(name, basis, process inlet, process outlet, outlet offset [K]) of the condenser and the reboiler.

    Counter-current ends as the sizing layer takes them: the condenser cools the top vapour
    (stage 1) to the reflux (TD less the subcooling); the reboiler heats the liquid from the last
    tray to stage N.
    """
    b = m.basis
    return (("condenser", b.condenser, m.T[1], m.TD, -m.problem.subcooling),
            ("reboiler", b.reboiler, m.T[m.N - 1], m.T[m.N], 0.0))


APPROACH_START = 0.5  # K beyond the minimum approach where a start's exchanger temperature is moved


def _start_within_approach(m) -> None:
    """Move a start's exchanger temperature that breaks a utility's minimum approach to just keep it.

    A start whose top condenses colder than the condenser's utility allows (a demethaniser's start
    at 1.5 x its reflux on a level chosen for a warmer reference) gives a negative temperature
    difference, whose cube root in the mean temperature difference the solver cannot evaluate.
    """
    for _, side, inlet, outlet, offset in _exchanger_sides(m):
        cooling = side.service == "cooling"
        ends = terminal_differences(side.service, inlet.value, outlet.value + offset, side.utility_in,
                                    side.utility_out)
        pairs = terminal_pairs(side.service, inlet, outlet, side.utility_in, side.utility_out)
        for (var, _), difference in zip(pairs, ends):
            short = side.minimum_approach + APPROACH_START - difference
            if short > 0.0:
                var.set_value(_inside(var.value + (short if cooling else -short), var))


def _add_costs(m) -> None:
    b = m.basis
    cond, reb = b.condenser, b.reboiler
    ends = {name: terminal_differences(side.service, inlet, outlet + offset, side.utility_in, side.utility_out)
            for name, side, inlet, outlet, offset in _exchanger_sides(m)}
    m.approach = pyo.Constraint(
        [(name, k) for name in ends for k in (0, 1)],
        rule=lambda m, name, k: ends[name][k] >= (cond if name == "condenser" else reb).minimum_approach)
    m.condenser_area = pyo.Expression(
        expr=exchanger_area(m.Qc * KILO, cond.U, mean_temperature_difference(*ends["condenser"])))
    m.reboiler_area = pyo.Expression(
        expr=exchanger_area(m.Qr * KILO, reb.U, mean_temperature_difference(*ends["reboiler"])))
    m.shell_volume = pyo.Expression(expr=m.tray_area * m.height)
    m.cost_shell = pyo.Expression(expr=b.trays.shells * b.shell.installed(m.shell_volume, PYOMO))
    m.tray_pricing = b.tray_cost.with_count(m.real_trays, b.tray_quantity_factor(m.real_trays))
    m.cost_trays = pyo.Expression(expr=m.tray_pricing.installed(m.tray_area, PYOMO))
    m.cost_condenser = pyo.Expression(expr=cond.cost.installed(m.condenser_area, PYOMO))
    m.cost_reboiler = pyo.Expression(expr=reb.cost.installed(m.reboiler_area, PYOMO))
    _add_condensate(m)
    m.capital = pyo.Expression(expr=m.cost_shell + m.cost_trays + m.cost_condenser + m.cost_reboiler
                               + m.cost_drum + m.cost_pump)
    hours = b.operating_hours
    m.condenser_utility = pyo.Expression(expr=yearly_cost(m.Qc * KILO, cond.price, hours))
    m.reboiler_utility = pyo.Expression(expr=yearly_cost(m.Qr * KILO, reb.price, hours))
    m.pump_utility = pyo.Expression(expr=yearly_cost(m.pump_power, m.electricity_price, hours))
    m.utilities = pyo.Expression(expr=m.condenser_utility + m.reboiler_utility + m.pump_utility)
    m.tac = pyo.Expression(expr=total_annualised_cost(m.capital, m.utilities, b.annualisation))
    m.penalty = pyo.Param(mutable=True, initialize=m.config.shortfall_penalty,
                          doc="objective charge per unit relative shortfall [thousand currency/yr]")
    m.objective = pyo.Objective(
        expr=m.tac / TAC_SCALE + m.penalty * sum(m.shortfall[k] for k in m.shortfall), sense=pyo.minimize)


def _add_condensate(m) -> None:
    """Reflux drum and pump on the condensate (zero without a basis).

    The condensate is reflux plus liquid distillate, V_1 = (R + 1) D, for a total condenser
    and the reflux R D alone for a partial one.
    """
    c = m.basis.condensate
    if c is None:
        m.drum_volume = m.pump_power = m.cost_drum = m.cost_pump = m.electricity_price = 0.0
        return
    volume_flow = (m.reflux if m.problem.partial_condenser else m.V[1]) * c.liquid_molar_volume
    m.drum_volume = pyo.Expression(expr=drum_volume(volume_flow, c.holdup_time, c.fill_fraction), doc="[m^3]")
    m.pump_power = pyo.Expression(
        expr=pump_shaft_power(volume_flow, c.liquid_density, m.height + c.head_beyond_shell, c.pump_efficiency),
        doc="shaft power [W]")
    m.cost_drum = pyo.Expression(expr=c.drum.installed(m.drum_volume, PYOMO))
    m.cost_pump = pyo.Expression(expr=c.pump.installed(m.pump_power, PYOMO))
    m.electricity_price = c.electricity_price


# ------------------------------------------------------------------ initialisation


def initialise(m, start: Profile) -> None:
    """Set every variable from a converged profile; sizes and duties follow from it."""
    f = m.problem.fitted
    m.R.set_value(_inside(start.reflux_ratio, m.R))
    m.D.set_value(_inside(start.distillate_flow, m.D))
    for j in m.J:
        k = j - 1
        m.T[j].set_value(_inside(start.T[k], m.T[j]))
        m.L[j].set_value(_inside(start.L[k], m.L[j]))
        m.V[j].set_value(_inside(start.V[k], m.V[j]))
        for i in m.C:
            # a start's trace fractions can come out a hair below zero (-2e-24 seen on 20 components)
            m.x[j, i].set_value(_inside(float(start.x[k, i]), m.x[j, i]))
            m.y[j, i].set_value(_inside(float(start.y[k, i]), m.y[j, i]))
    if m.problem.partial_condenser:
        T_d, x_d, y_d = partial_condenser_split(m.problem, start.y[0], start.reflux_ratio, start.x[0])
        for i in m.C:
            m.xD[i].set_value(_inside(float(x_d[i]), m.xD[i]))
            m.yD[i].set_value(_inside(float(y_d[i]), m.yD[i]))
    else:
        T_d = f.bubble_temperature(m.problem.top_pressure, start.y[0])
    m.TD.set_value(_inside(T_d, m.TD))
    _start_within_approach(m)
    m.Qc.set_value(_inside(pyo.value(m.V[1] * m.hV[1] - m.reflux * m.h_reflux - m.D * m.h_distillate), m.Qc))
    m.Qr.set_value(_inside(pyo.value(m.V[m.N] * (m.hV[m.N] - m.hL[m.N])), m.Qr))
    if m.config.energy_balances:
        m.Qr.set_value(_inside(pyo.value(m.Qc + m.L[m.N] * m.hL[m.N] + m.D * m.h_distillate
                                         - m.problem.feed_flow * m.h_feed), m.Qr))
    need = required_areas(m)
    m.diameter.set_value(_inside(diameter_of(max(need.values(), default=0.0)), m.diameter))
    watch_flooding(m, need)
    # The shortfall charge scales with the start's TAC: large enough to be exact, small
    # enough to keep the problem well conditioned (measured on the five-component example:
    # a fixed 1e5 stalled ripopt on configurations that solve with 1e3).
    m.penalty.set_value(m.config.shortfall_penalty * max(pyo.value(m.tac), 1.0) / TAC_SCALE)


# Trays, besides each section's end trays, whose flooding constraint is written from the start: those
# needing the largest cross-section at the start point.
WATCHED_TRAYS = 3
# Relative excess of a tray's required cross-section over the tray's at which its constraint is added.
FLOODING_SLACK = 1e-6


def watch_flooding(m, need: dict[int, float] | None = None) -> None:
    """Keep the flooding constraints of the trays that can set the diameter only: the :data:`WATCHED_TRAYS`
    whose ``need`` (required cross-section at the start point, as :func:`required_areas`) is largest and
    each section's end trays; ``need`` None keeps all.

    One tray sets the diameter; the others' constraints are slack, yet each is written to the solver's
    file with its densities, flow parameter and allowable velocity. Measured on the benzene optimum (27
    stages, feed on 13; 26 trays, the bottom tray binding): 61-71 ms a solve with all of them, 46-47 ms
    with five, the same diameter and TAC within 0.2 USD a year. :func:`unwatched_flooding` finds a
    left-out constraint the solution breaks, which is then added and the model solved again
    (:func:`~disteco.optimisation.solve.run_solver`), so the answer is the full model's.
    """
    kept = set(m.TRAYS) if need is None else (
        set(sorted(need, key=need.get, reverse=True)[:WATCHED_TRAYS]) | ({1, m.NF - 1, m.NF, m.N - 1} & set(need)))
    for j in m.TRAYS:
        if j in kept:
            m.flooding[j].activate()
        else:
            m.flooding[j].deactivate()


def unwatched_flooding(m) -> list[int]:
    """Trays whose flooding constraint was left out (:func:`watch_flooding`) and whose required
    cross-section at the current point exceeds the tray's by more than :data:`FLOODING_SLACK`."""
    left_out = [j for j in m.TRAYS if not m.flooding[j].active]
    if not left_out:
        return []
    area, need = pyo.value(m.tray_area), required_areas(m)
    return [j for j in left_out if need[j] > area * (1.0 + FLOODING_SLACK)]


def required_areas(m) -> dict[int, float]:
    """Tray cross-section flooding needs on each tray at the current point [m^2], on floats.

    The same function as the model's flooding constraints; walking the Pyomo expressions
    instead took about 0.2 s per configuration read back (benzene-toluene, 29 stages).
    """
    f, trays = m.problem.fitted, m.basis.trays
    need = {}
    for j in m.TRAYS:
        x, y = [pyo.value(m.x[j, i]) for i in m.C], [pyo.value(m.y[j, i]) for i in m.C]
        T = pyo.value(m.T[j])
        need[j] = required_tray_area(
            pyo.value(m.V[j]) * f.molar_mass(y), pyo.value(m.L[j]) * f.molar_mass(x), liquid_density(f, T, x),
            vapour_density(m.P[j], T, f.molar_mass(y)), f.surface_tension_of(T, x), trays.tray_spacing,
            trays.flooding_fraction, trays.flooding_method, trays.system_factor, trays.downcomer_fraction)
    return need


def _inside(value: float, var) -> float:
    lo, hi = var.lb, var.ub
    return float(min(max(value, lo if lo is not None else value), hi if hi is not None else value))
