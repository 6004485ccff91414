/*
 * Private to the core: CP_AVX_CLONES compiles a hot function twice on x86-64 with glibc, for
 * SSE2 and for AVX (whose three-operand instructions save the register copies SSE2 needs,
 * and whose registers hold four doubles), and the loader picks the one the processor runs
 * (GCC's and Clang's target_clones, an ifunc).  AVX has no fused multiply-add, so both give
 * the same numbers to the last bit.  Clang exports the dispatcher's symbol even for a static
 * function: give such functions a cp_ prefix.  Elsewhere it expands to nothing.  Not
 * installed.
 */
#ifndef COLDPREP_CLONES_INT_H
#define COLDPREP_CLONES_INT_H

#if defined(__x86_64__) && defined(__GLIBC__) && defined(__has_attribute)
#if __has_attribute(target_clones)
#define CP_AVX_CLONES __attribute__((target_clones("avx", "default")))
#endif
#endif
#ifndef CP_AVX_CLONES
#define CP_AVX_CLONES
#endif

#endif
