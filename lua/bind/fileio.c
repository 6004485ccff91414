/*
 * Careful file opening for the sweep writers and the private Lua module "coldprep.files"
 * (see fileio.h).  Locks are advisory flock(2) locks on PATH.lock; the file is not created
 * with O_EXCL because a lock must survive a killed holder (the kernel drops the flock, a
 * later run takes the same file), but it is never reached through a symbolic link and must
 * be a regular file.
 */
#include <errno.h>
#include <fcntl.h>
#include <lauxlib.h>
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include "fileio.h"

int cpl_open_nofollow(const char *path, int flags, mode_t mode)
{
    int fd;
    do
        fd = open(path, flags | O_NOFOLLOW | O_CLOEXEC, mode);
    while (fd < 0 && errno == EINTR);
    return fd;
}

int cpl_create_temp(const char *path)
{
    if (unlink(path) != 0 && errno != ENOENT)
        return -1;
    return cpl_open_nofollow(path, O_WRONLY | O_CREAT | O_EXCL | O_APPEND, 0644);
}

int cpl_lock_take(const char *out, char *lock, size_t size, char *err, size_t errlen)
{
    snprintf(lock, size, "%s.lock", out);
    for (;;) {
        int fd = cpl_open_nofollow(lock, O_RDWR | O_CREAT, 0644);
        struct stat held, now;
        if (fd < 0 || fstat(fd, &held) != 0 || !S_ISREG(held.st_mode)) {
            int e = fd < 0 ? errno : EINVAL;
            snprintf(err, errlen, "cannot create the lock %s: %s", lock,
                     e == ELOOP ? "it is a symbolic link" : strerror(e));
            if (fd >= 0)
                close(fd);
            return -1;
        }
        if (flock(fd, LOCK_EX | LOCK_NB) != 0) {
            if (errno == EWOULDBLOCK)
                snprintf(err, errlen, "another coldprep sweep is writing %s; wait for it to "
                         "end or stop it first", out);
            else
                snprintf(err, errlen, "cannot lock %s: %s", lock, strerror(errno));
            close(fd);
            return -1;
        }
        if (lstat(lock, &now) == 0 && held.st_ino == now.st_ino && held.st_dev == now.st_dev)
            return fd;
        close(fd); /* the file was replaced between open and flock: take the new one */
    }
}

void cpl_lock_release(int fd, const char *lock)
{
    if (fd < 0)
        return;
    unlink(lock);
    close(fd);
}

int cpl_same_file(const char *a, const char *b)
{
    struct stat sa, sb;
    return stat(a, &sa) == 0 && stat(b, &sb) == 0 && sa.st_dev == sb.st_dev
           && sa.st_ino == sb.st_ino;
}

/* ---- the Lua module ---------------------------------------------------------------- */

#define LOCK_TYPE "coldprep.files.lock"

typedef struct file_lock {
    int fd;
    char path[4200];
} file_lock;

static int lock_release(lua_State *L)
{
    file_lock *k = luaL_checkudata(L, 1, LOCK_TYPE);
    cpl_lock_release(k->fd, k->path);
    k->fd = -1;
    return 0;
}

static int l_lock(lua_State *L)
{
    const char *path = luaL_checkstring(L, 1);
    file_lock *k = lua_newuserdatauv(L, sizeof *k, 0);
    k->fd = -1;
    luaL_setmetatable(L, LOCK_TYPE);
    char err[8400];
    k->fd = cpl_lock_take(path, k->path, sizeof k->path, err, sizeof err);
    if (k->fd < 0) {
        lua_pushnil(L);
        lua_pushstring(L, err);
        return 2;
    }
    return 1;
}

static int close_stream(lua_State *L)
{
    luaL_Stream *p = luaL_checkudata(L, 1, LUA_FILEHANDLE);
    int ok = fclose(p->f) == 0;
    return luaL_fileresult(L, ok, NULL);
}

static int l_open(lua_State *L)
{
    const char *path = luaL_checkstring(L, 1);
    const char *mode = luaL_checkstring(L, 2);
    int flags;
    if (strcmp(mode, "r") == 0)
        flags = O_RDONLY;
    else if (strcmp(mode, "w") == 0)
        flags = O_WRONLY | O_CREAT | O_TRUNC;
    else if (strcmp(mode, "a") == 0)
        flags = O_WRONLY | O_CREAT | O_APPEND;
    else
        return luaL_argerror(L, 2, "mode must be \"r\", \"w\" or \"a\"");
    luaL_Stream *p = lua_newuserdatauv(L, sizeof *p, 0);
    p->closef = NULL; /* not a file yet: its collection closes nothing */
    luaL_setmetatable(L, LUA_FILEHANDLE);
    int fd = cpl_open_nofollow(path, flags, 0644);
    if (fd >= 0 && (p->f = fdopen(fd, mode)) == NULL)
        close(fd), fd = -1;
    if (fd < 0) {
        int e = errno;
        lua_pushnil(L);
        lua_pushfstring(L, "%s: %s", path, e == ELOOP ? "is a symbolic link" : strerror(e));
        lua_pushinteger(L, e);
        return 3;
    }
    p->closef = close_stream;
    return 1;
}

static int l_realpath(lua_State *L)
{
    const char *path = luaL_checkstring(L, 1);
    char *r = realpath(path, NULL);
    if (r == NULL) {
        lua_pushnil(L);
        lua_pushfstring(L, "%s: %s", path, strerror(errno));
        return 2;
    }
    lua_pushstring(L, r);
    free(r);
    return 1;
}

static int l_kind(lua_State *L)
{
    struct stat st;
    if (lstat(luaL_checkstring(L, 1), &st) != 0) {
        lua_pushnil(L);
        return 1;
    }
    lua_pushstring(L, S_ISLNK(st.st_mode) ? "link" : S_ISREG(st.st_mode) ? "file"
                      : S_ISDIR(st.st_mode) ? "directory" : "other");
    return 1;
}

int cpl_open_files(lua_State *L)
{
    if (luaL_newmetatable(L, LOCK_TYPE)) {
        static const luaL_Reg methods[] = {{"release", lock_release}, {NULL, NULL}};
        luaL_newlib(L, methods);
        lua_setfield(L, -2, "__index");
        lua_pushcfunction(L, lock_release);
        lua_setfield(L, -2, "__gc");
        lua_pushcfunction(L, lock_release);
        lua_setfield(L, -2, "__close");
    }
    lua_pop(L, 1);
    static const luaL_Reg funcs[] = {
        {"lock", l_lock},         {"open", l_open},
        {"realpath", l_realpath}, {"kind", l_kind}, {NULL, NULL}};
    luaL_newlib(L, funcs);
    return 1;
}
