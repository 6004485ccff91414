/*
 * Careful file opening shared by the sweep writers (cp.sweep in Lua, `coldprep sweep` and
 * `coldprep merge`): outputs, journals, markers and locks are never reached through a
 * symbolic link in their last path component (O_NOFOLLOW), temporary files are created
 * afresh (O_EXCL) so that nothing planted under their name is written through, and one
 * lock protocol, PATH.lock held with flock(2), keeps two writers off one output.  Also the
 * private Lua module "coldprep.files" that gives the Lua side the same operations.
 */
#ifndef COLDPREP_FILEIO_H
#define COLDPREP_FILEIO_H

#include <lua.h>
#include <stddef.h>
#include <sys/types.h>

/* open(2) with O_NOFOLLOW | O_CLOEXEC added: a symbolic link as the last component fails
 * with ELOOP.  Returns the descriptor or -1 (errno set). */
int cpl_open_nofollow(const char *path, int flags, mode_t mode);

/* Create the temporary file `path` for writing: an old file (or link) of that name is
 * removed, then it is created with O_EXCL | O_NOFOLLOW, mode 0644.  Descriptor or -1. */
int cpl_create_temp(const char *path);

/* Take the lock PATH.lock of the output `out` (its name is written to lock[size]): flock
 * LOCK_EX | LOCK_NB on a regular file opened without following links, retried when a
 * finishing writer unlinked it meanwhile.  Returns the held descriptor; -1 with a message
 * in err ("another coldprep sweep is writing OUT; ..." when it is busy). */
int cpl_lock_take(const char *out, char *lock, size_t size, char *err, size_t errlen);

/* Release a lock taken by cpl_lock_take: unlink PATH.lock, close. */
void cpl_lock_release(int fd, const char *lock);

/* 1 when both paths exist and name the same file (device and inode), else 0. */
int cpl_same_file(const char *a, const char *b);

/* luaopen function of the private module "coldprep.files" (preloaded by luaopen_coldprep):
 *   files.lock(path) -> lock (a handle with :release(), also released when collected or
 *                       closed), or nil, message
 *   files.open(path, "r" | "w" | "a") -> a Lua file handle opened without following a
 *                       symbolic link, or nil, message, errno
 *   files.realpath(path) -> the absolute path without links, "." or "..", or nil, message
 *   files.kind(path) -> "file", "directory", "link", "other" (device, pipe, ...) or nil
 *                       when there is nothing (the last component's link not followed) */
int cpl_open_files(lua_State *L);

#endif
