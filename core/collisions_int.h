/*
 * Private to the collision model: the argument checks shared by the hold (collisions_hold.c)
 * and the evaporation trajectory (collisions_evap.c).  Not installed.
 */
#ifndef COLDPREP_COLLISIONS_INT_H
#define COLDPREP_COLLISIONS_INT_H

#include "coldprep/collisions.h"

/* A thermal cloud: number in [1, 1e12], temperature in (0, 1e-2] K, each omega in (0, 1e7]
 * rad/s, mass in (1e-28, 1e-22] kg.  ctx names the calling function in messages. */
cp_status cp_collisions_check_cloud(const char *ctx, double number, double temperature,
                                    const double omega[3], double mass, cp_error *err);

/* wave is CP_LOSS_S_WAVE or CP_LOSS_P_WAVE. */
cp_status cp_collisions_check_wave(const char *ctx, cp_loss_wave wave, cp_error *err);

#endif
