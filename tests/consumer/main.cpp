// Uses the installed or embedded library once and checks the answer: gamma(0.5) = 2 / sqrt(3).
#include <eigenzeit/eigenzeit.hpp>

#include <cmath>
#include <cstdio>

int main() {
    const double gamma = eigenzeit::lorentz_factor(0.5);
    const double expected = 1.1547005383792515;
    const bool ok = std::fabs(gamma - expected) <= 1e-15 * expected;
    std::printf("eigenzeit::lorentz_factor(0.5) = %.17g, expected %.17g: %s\n", gamma, expected,
                ok ? "ok" : "WRONG");
    return ok ? 0 : 1;
}
