/*
 * The inner loop of the batch ramp-rate law (cp_feshbach_ramp_law in feshbach.c, which
 * validates every input first).  This file alone is compiled with -O3 -ffast-math (see
 * CMakeLists.txt): only then does GCC call glibc's vector expm1 (libmvec) and process two to
 * four rates per instruction, which the target of >= 1e8 evaluations/s on one core
 * needs on a loaded machine.  Nothing here may depend on NaN or infinity semantics: the
 * rates are finite and 1e-6 <= |rate| <= 1e9 T/s, the coefficient finite and positive.
 */
#include <math.h>

#include "feshbach_int.h"

void cp_feshbach_ramp_kernel(double coefficient, double max_efficiency,
                             const double *restrict rates, double *restrict efficiency,
                             size_t n)
{
    for (size_t i = 0; i < n; i++)
        efficiency[i] = max_efficiency * -expm1(-coefficient / fabs(rates[i]));
}
