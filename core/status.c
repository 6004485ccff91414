/*
 * Status strings, library initialisation and version.  cp_init switches GSL's default
 * error handler (which calls abort()) off exactly once, whatever thread gets there first.
 */
#include "coldprep/status.h"

#include <gsl/gsl_errno.h>
#include <threads.h>

#include "version_int.h"

const char *cp_strerror(cp_status status)
{
    switch (status) {
    case CP_OK: return "success";
    case CP_EINVAL: return "invalid argument";
    case CP_ENOTFOUND: return "not found";
    case CP_ENOCONV: return "no convergence";
    case CP_ENOMEM: return "out of memory";
    case CP_ENUMERIC: return "numerical failure";
    case CP_ECANCELED: return "cancelled";
    case CP_ETOOLONG: return "estimated work too long";
    }
    return "unknown status";
}

static once_flag init_once = ONCE_FLAG_INIT;

static void init_body(void)
{
    gsl_set_error_handler_off();
}

void cp_init(void)
{
    call_once(&init_once, init_body);
}

const char *cp_version(void)
{
    return CP_VERSION_STRING;
}
