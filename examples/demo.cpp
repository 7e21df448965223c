// eigenzeit demo: one invented scenario, six moving objects from a walking pace to a
// cosmic-ray proton, each quantity from eigenzeit beside the textbook formula in double and
// an MPFR reference (1024 bits) evaluated on the same double inputs.
//
// Every object, name and number below is invented for this demo, except the proton rest
// energy (CODATA 2018, 938.27208816 MeV) and the speed of light (exact SI value).
//
// A second section, "invented constellation", gives the daily clock budget of three invented
// orbits (timing/orbit_clock.hpp) and checks each against one day of samples integrated by
// timing/trajectory.hpp.  The orbits are invented; GM_E and L_G are the IERS values of
// constants.hpp.
//
// A third section, "invented beamline", follows particles of an invented test beam through the
// frames layer: a boost to a decaying particle's rest frame, a photon pair at a tiny opening
// angle, and two boosts composed with their Wigner rotation.  The beamline and its figures are
// invented; the electron and proton rest energies are CODATA 2018 values.
#include <mpfr.h>

#include <boost/multiprecision/mpfr.hpp>

#include <array>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include <eigenzeit/eigenzeit.hpp>
#include <eigenzeit/timing/clock_rate.hpp>
#include <eigenzeit/timing/orbit_clock.hpp>
#include <eigenzeit/timing/potential.hpp>
#include <eigenzeit/timing/trajectory.hpp>
#include <eigenzeit/timing/two_part_time.hpp>

namespace {

constexpr double c_m_per_s = 299792458.0;  // exact, SI definition of the metre
constexpr mpfr_prec_t prec = 1024;

struct object {
  const char* name;
  const char* what;
  bool from_energy;  // true: kinetic energy and mass in GeV; false: speed in m/s
  double a, b;
};

// The invented cast (names and figures are ours, for illustration only).
const object cast[] = {
    {"Technician Oda", "walking across the Harrow test hall at 1.4 m/s", false, 1.4, 0},
    {"Lyra-4", "navigation satellite of the fictional Lyra constellation, 7612 m/s", false, 7612.4, 0},
    {"Perihelion-3", "solar probe at closest approach, 191.7 km/s", false, 191700.0, 0},
    {"Argent ring", "proton at 24.5 GeV kinetic energy in a fictional synchrotron", true, 24.5,
     0.93827208816},
    {"Halden beamline", "proton at 6.5 TeV kinetic energy", true, 6500.0, 0.93827208816},
    {"Cosmic ray AQ-1", "proton at 3.2e20 eV caught by a fictional air-shower array", true, 3.2e11,
     0.93827208816},
};

struct mp {
  mpfr_t v;
  mp() { mpfr_init2(v, prec); }
  mp(const mp&) = delete;
  mp& operator=(const mp&) = delete;
  ~mp() { mpfr_clear(v); }
};

// Correct decimal digits of x against the reference: -log10(relative error), capped at 17.
std::string digits(double x, const mpfr_t ref) {
  if (!std::isfinite(x)) return "none (inf)";
  mp d, r;
  mpfr_set_d(d.v, x, MPFR_RNDN);
  mpfr_sub(d.v, d.v, ref, MPFR_RNDN);
  if (mpfr_zero_p(d.v)) return "all";
  mpfr_div(r.v, d.v, ref, MPFR_RNDN);
  mpfr_abs(r.v, r.v, MPFR_RNDN);
  const double rel = mpfr_get_d(r.v, MPFR_RNDN);
  const double ulp_rel = std::ldexp(1.0, -52);
  if (rel <= ulp_rel) return "all (<= 1 ulp)";
  if (rel >= 1) return "none";
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f of ~16", -std::log10(rel));
  return buf;
}

void row(const char* quantity, double careful, double naive, const mpfr_t ref) {
  char refs[64];
  mpfr_snprintf(refs, sizeof refs, "%.16Re", ref);
  std::printf("  %-18s %-24.16e %-24.16e %-24s  naive: %-16s eigenzeit: %s\n", quantity, careful,
              naive, refs, digits(naive, ref).c_str(), digits(careful, ref).c_str());
}


// ---- invented constellation -------------------------------------------------------------------

struct invented_orbit {
  const char* name;
  const char* what;
  double a_km, e, inclination_deg;
};

// Three invented satellites (names, purposes and elements are ours, for illustration only).
const invented_orbit constellation[] = {
    {"Lark-12", "low orbit survey craft", 7078.0, 0.0012, 98.2},
    {"Quillon MEO-7", "navigation satellite", 27977.0, 0.003, 56.0},
    {"Tamsin HEO-1", "high-latitude relay", 26560.0, 0.72, 63.4},
};

/// One day of an invented Kepler orbit sampled every 30 s (Kepler's equation by Newton's
/// method), integrated with trajectory_clock_offset; returns the integral, its estimate, and
/// the closed form (mean rate times a day plus the change of the periodic term).
void integrate_day(const invented_orbit& o, double& integrated, double& estimate, double& closed) {
  const double gm = eigenzeit::constants::GM_earth<double>();
  const double a = o.a_km * 1e3, e = o.e;
  const double n = std::sqrt(gm / (a * a * a));
  const double ci = std::cos(o.inclination_deg * 3.14159265358979323846 / 180);
  const double si = std::sin(o.inclination_deg * 3.14159265358979323846 / 180);
  auto anomaly = [&](double t) {
    const double M = n * t;
    double E = e < 0.8 ? M : 3.14159265358979323846;
    for (int k = 0; k < 60; ++k) E -= (E - e * std::sin(E) - M) / (1 - e * std::cos(E));
    return E;
  };
  std::vector<eigenzeit::two_part_time<double>> t;
  std::vector<std::array<double, 3>> r, v;
  const auto t0 = eigenzeit::two_part_time<double>::from_days(2461000.0, 0.5);  // invented epoch
  for (int i = 0; i <= 2880; ++i) {
    const double E = anomaly(30.0 * i);
    const double den = 1 - e * std::cos(E), root = std::sqrt(1 - e * e);
    const double px = a * (std::cos(E) - e), py = a * root * std::sin(E);
    const double vx = -n * a * std::sin(E) / den, vy = n * a * root * std::cos(E) / den;
    t.push_back(eigenzeit::add_seconds(t0, 30.0 * i));
    r.push_back({px, py * ci, py * si});
    v.push_back({vx, vy * ci, vy * si});
  }
  const auto res = eigenzeit::trajectory_clock_offset(t, r, v, eigenzeit::point_mass_potential<double>{gm});
  const eigenzeit::kepler_orbit<double> k{a, e, gm};
  integrated = res.value;
  estimate = res.error_estimate;
  closed = eigenzeit::orbit_rate_offset(k) * 86400.0 +
           (eigenzeit::orbit_periodic_offset(k, anomaly(86400.0)) - eigenzeit::orbit_periodic_offset(k, 0.0));
}

void invented_constellation() {
  std::printf(
      "\ninvented constellation: three invented satellites (names, purposes and orbits are "
      "made up for this demo).\nDaily clock budget of a clock on board against TT (a clock on "
      "the geoid), Kepler orbit about a point-mass Earth, GM_E and L_G from the IERS "
      "Conventions (2010):\n");
  std::printf("  %-14s %-24s %9s %6s %16s %16s %16s %14s\n", "satellite", "role", "a (km)", "e",
              "velocity us/day", "potential us/day", "total us/day", "ecc. amp. ns");
  for (const invented_orbit& o : constellation) {
    const eigenzeit::kepler_orbit<double> k{o.a_km * 1e3, o.e, eigenzeit::constants::GM_earth<double>()};
    const auto b = eigenzeit::orbit_rate_terms(k);
    std::printf("  %-14s %-24s %9.1f %6.4f %+16.4f %+16.4f %+16.4f %14.3f\n", o.name, o.what,
                o.a_km, o.e, b.velocity * 86400e6, b.potential * 86400e6, b.total * 86400e6,
                eigenzeit::orbit_periodic_amplitude(k) * 1e9);
  }
  std::printf("  (total > 0: the clock on board runs fast against the ground; the eccentricity "
              "term swings by +-amplitude once per orbit)\n");
  std::printf("One day sampled every 30 s, integrated (proper time minus TCG) against the closed "
              "Kepler form,\nwhich stops at 1/c^2: the differences are the 1/c^4 terms that the "
              "integrated rate keeps, plus the rule's error:\n");
  for (const invented_orbit& o : constellation) {
    double integrated = 0, estimate = 0, closed = 0;
    integrate_day(o, integrated, estimate, closed);
    std::printf("  %-14s integrated %+.9e s, closed form %+.9e s, difference %+.3f ps "
                "(error estimate %.1e ps)\n", o.name, integrated, closed,
                (integrated - closed) * 1e12, estimate * 1e12);
  }
  std::printf("eigenzeit is not certified for safety-of-life navigation or timing; users must "
              "follow the governing interface specifications and do their own validation.\n");
}


// ---- invented beamline ------------------------------------------------------------------------

using mpf = boost::multiprecision::mpfr_float;

/// Correct decimal digits of `got` against `ref` (17 = exact to double).
double digits_of(double got, const mpf& ref) {
  if (ref == 0) return got == 0 ? 17.0 : 0.0;
  const double rel = static_cast<double>(abs((mpf(got) - ref) / ref));
  return rel == 0 ? 17.0 : std::max(0.0, std::min(17.0, -std::log10(rel)));
}

void beam_row(const char* what, double ours, double naive, const mpf& ref) {
  std::printf("  %-34s %-24.17g %-24.17g %4.1f / %4.1f digits\n", what, ours, naive, digits_of(ours, ref),
              digits_of(naive, ref));
}

void invented_beamline() {
  mpf::default_precision(160);
  const double proton = 938.27208816;   // MeV, CODATA 2018
  const double electron = 0.51099895;   // MeV, CODATA 2018 (0.51099895000)
  std::printf("\n---- invented beamline \"Kestrel\" (all figures invented) ----\n");
  std::printf("  %-34s %-24s %-24s %s\n", "quantity", "eigenzeit", "textbook formula", "correct digits (ours / textbook)");

  // 1. A 7 TeV proton of the invented beam, seen from its own rest frame (a boost with the
  //    proton's velocity): it must be at rest there.  momentum::boosted carries the energy to
  //    twice the precision; the textbook 4x4 matrix built from rounded gamma and beta gamma
  //    leaves a momentum of its own rounding errors.
  const eigenzeit::momentum<double> p(proton, {1234.5, -2345.6, 6.9999e6});
  const eigenzeit::lorentz_boost<double> to_rest(p.p(), p.speed());
  const eigenzeit::vec3<double> rest = p.boosted(to_rest).p();
  // Textbook: L = [[g, -bg n^T], [-bg n, 1 + (g - 1) n n^T]] applied to (E, p).
  const double e = p.energy(), g = e / proton, bg = p.p_norm() / proton;
  const eigenzeit::vec3<double> n = p.p() / p.p_norm();
  const double a = eigenzeit::dot(n, p.p());
  const eigenzeit::vec3<double> naive = p.p() + ((g - 1) * a - bg * e) * n;
  std::printf("  %-34s %-24.3g %-24.3g (exact: 0)\n", "proton momentum at rest, |p| (MeV)",
              eigenzeit::norm(rest), eigenzeit::norm(naive));

  // 2. Two photons from an invented source, 50 GeV each, 1e-8 rad apart: their pair mass.
  const double angle = 1e-8;
  const eigenzeit::momentum<double> g1(0.0, {0.0, 0.0, 5.0e4});
  const eigenzeit::momentum<double> g2(0.0, {5.0e4 * std::sin(angle), 0.0, 5.0e4 * std::cos(angle)});
  const double esum = g1.energy() + g2.energy();
  const double pz = g1.p().z + g2.p().z, px = g2.p().x;
  const double naive_m2 = esum * esum - (px * px + pz * pz);
  const mpf mx = mpf(g2.p().x), mz = mpf(g2.p().z);
  const mpf e2 = sqrt(mx * mx + mz * mz);
  const mpf ref_m = sqrt(2 * (mpf(5.0e4) * e2 - mpf(5.0e4) * mz));
  beam_row("photon pair mass at 1e-8 rad (MeV)", eigenzeit::invariant_mass(g1, g2),
           naive_m2 > 0 ? std::sqrt(naive_m2) : 0.0, ref_m);

  // 3. An electron of 2 eV kinetic energy-scale momentum (invented): kinetic energy.
  const eigenzeit::momentum<double> slow(electron, {1.0e-3, 0.0, 0.0});
  const mpf ek = sqrt(mpf(electron) * electron + mpf(1.0e-3) * 1.0e-3) - electron;
  beam_row("slow electron kinetic energy (MeV)", slow.kinetic_energy(),
           std::sqrt(electron * electron + 1e-6) - electron, ek);

  // 4. Two boosts of an invented transfer line, 0.9 c along x then 0.9 c along y: one boost
  //    and a Wigner rotation of 2 atan(...) about z.
  const auto first = eigenzeit::lorentz_boost<double>::from_velocity({0.9, 0.0, 0.0});
  const auto second = eigenzeit::lorentz_boost<double>::from_velocity({0.0, 0.9, 0.0});
  const auto c = eigenzeit::compose(first, second);
  std::printf("  composed: gamma %.17g, Wigner rotation %.17g rad about (%g, %g, %g)\n",
              c.boost.speed().gamma(), c.rotation.angle, c.rotation.axis.x, c.rotation.axis.y,
              c.rotation.axis.z);
  std::printf("All beamline figures are invented and serve only to show where the textbook "
              "formulas lose digits.\n");
}

}  // namespace

int main() {
  std::printf(
      "eigenzeit %d.%d.%d demo - invented scenario: six objects, from a walking pace to a cosmic "
      "ray.\nFor each quantity: eigenzeit (double), the textbook formula (double), and MPFR at %d "
      "bits on the same double inputs; then the correct decimal digits of each.\n",
      EIGENZEIT_VERSION_MAJOR, EIGENZEIT_VERSION_MINOR, EIGENZEIT_VERSION_PATCH,
      static_cast<int>(prec));
  std::printf("Not certified for safety-of-life navigation or timing; see README, Cautions.\n");

  for (const object& o : cast) {
    // eigenzeit, and the textbook path a typical code would take, both in double.
    eigenzeit::speed<double> s;
    double beta_naive;
    mp beta, deficit, gamma, gm1, inv, frac, eta, u, t;
    if (o.from_energy) {
      s = eigenzeit::speed<double>::from_kinetic_energy(o.a, o.b);
      const double g = 1 + o.a / o.b;
      beta_naive = std::sqrt(1 - 1 / (g * g));
      // Reference: gamma = 1 + K/m exactly, beta = sqrt(1 - 1/gamma^2).
      mpfr_set_d(t.v, o.a, MPFR_RNDN);
      mpfr_div_d(t.v, t.v, o.b, MPFR_RNDN);
      mpfr_add_ui(gamma.v, t.v, 1, MPFR_RNDN);
      mpfr_sqr(t.v, gamma.v, MPFR_RNDN);
      mpfr_ui_div(t.v, 1, t.v, MPFR_RNDN);
      mpfr_ui_sub(t.v, 1, t.v, MPFR_RNDN);
      mpfr_sqrt(beta.v, t.v, MPFR_RNDN);
    } else {
      const double b = o.a / c_m_per_s;
      s = eigenzeit::speed<double>::from_beta(b);
      beta_naive = b;
      mpfr_set_d(beta.v, b, MPFR_RNDN);
    }
    // Reference views by their definitions.
    mpfr_ui_sub(deficit.v, 1, beta.v, MPFR_RNDN);
    mpfr_sqr(t.v, beta.v, MPFR_RNDN);
    mpfr_ui_sub(t.v, 1, t.v, MPFR_RNDN);
    mpfr_sqrt(inv.v, t.v, MPFR_RNDN);
    mpfr_ui_div(gamma.v, 1, inv.v, MPFR_RNDN);
    mpfr_sub_ui(gm1.v, gamma.v, 1, MPFR_RNDN);
    mpfr_ui_sub(frac.v, 1, inv.v, MPFR_RNDN);
    mpfr_atanh(eta.v, beta.v, MPFR_RNDN);
    mpfr_mul(u.v, beta.v, gamma.v, MPFR_RNDN);

    const double b = beta_naive;
    std::printf("\n%s: %s (invented)\n", o.name, o.what);
    std::printf("  %-18s %-24s %-24s %-24s  correct digits\n", "quantity", "eigenzeit", "textbook formula",
                "MPFR reference");
    row("gamma", s.gamma(), 1 / std::sqrt(1 - b * b), gamma.v);
    row("gamma - 1", s.gamma_m1(), 1 / std::sqrt(1 - b * b) - 1, gm1.v);
    row("1 - beta", s.beta_deficit(), 1 - b, deficit.v);
    row("1 - 1/gamma", s.dilation_fraction(), 1 - std::sqrt(1 - b * b), frac.v);
    row("rapidity", s.rapidity(), 0.5 * std::log((1 + b) / (1 - b)), eta.v);
    row("beta * gamma", s.proper_speed(), b / std::sqrt(1 - b * b), u.v);
    if (!o.from_energy) {
      // What a moving clock loses per day, in seconds: (1 - 1/gamma) * 86400.
      mpfr_mul_ui(t.v, frac.v, 86400, MPFR_RNDN);
      std::printf("  clock lag per day: eigenzeit %.6e s, textbook %.6e s, MPFR %.6e s\n",
                  s.dilation_fraction() * 86400.0, (1 - std::sqrt(1 - b * b)) * 86400.0,
                  mpfr_get_d(t.v, MPFR_RNDN));
    }
  }
  std::printf("\nAll figures above come from an invented scenario and serve only to show where "
              "the textbook formulas lose digits.\n");
  invented_constellation();
  invented_beamline();
  return 0;
}
