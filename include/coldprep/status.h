/*
 * coldprep — status codes, the error record, and library initialisation.
 *
 * Every public core function returns a cp_status and writes its results through
 * out-parameters.  On failure it fills the caller-provided cp_error (which may be NULL)
 * with one line that names the parameter, its value, its unit and the allowed range, and
 * poisons its numeric out-parameters with NaN so an ignored status cannot pass for a
 * plausible number.  The caller owns the cp_error; the library never allocates it.
 */
#ifndef COLDPREP_STATUS_H
#define COLDPREP_STATUS_H

#include <signal.h>

#ifdef __cplusplus
extern "C" {
#endif

typedef enum cp_status {
    CP_OK = 0,        /* success */
    CP_EINVAL = 1,    /* an argument is NaN, infinite, or outside its allowed range */
    CP_ENOTFOUND = 2, /* a named item (species, resonance, ...) does not exist */
    CP_ENOCONV = 3,   /* an iterative method did not converge */
    CP_ENOMEM = 4,    /* memory allocation failed */
    CP_ENUMERIC = 5,  /* a numerical routine (GSL, ODE, eigen solver) failed */
    CP_ECANCELED = 6, /* stopped because the caller's cancel flag was set (Ctrl-C) */
    CP_ETOOLONG = 7   /* refused before starting: the work estimate exceeds the caller's limit */
} cp_status;

/* A cancel flag: long computations with a `_cancellable` variant take a pointer to one,
 * poll it while they run and stop with CP_ECANCELED once it is non-zero (a signal handler
 * may set it).  The caller owns it; NULL means never cancelled. */
typedef volatile sig_atomic_t cp_cancel_flag;

#define CP_ERROR_MESSAGE_SIZE 512

typedef struct cp_error {
    cp_status status;
    char message[CP_ERROR_MESSAGE_SIZE];
} cp_error;

/* A short English description of a status code ("invalid argument", ...). */
const char *cp_strerror(cp_status status);

/* Initialise the library: switches GSL's aborting error handler off.  Idempotent and
 * thread-safe; core functions that use GSL call it themselves, so calling it is optional. */
void cp_init(void);

/* The library's version as "MAJOR.MINOR.PATCH". */
const char *cp_version(void);

#ifdef __cplusplus
}
#endif
#endif
