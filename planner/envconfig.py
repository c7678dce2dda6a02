"""Strict readers for the environment variables that configure Linecast.

Settings read the environment only through these helpers, so that a typo such
as ``DEBUG=yse`` stops the start-up with a message naming the variable instead
of silently meaning "false".  Every helper takes the environment as a mapping
so tests can pass a plain dict instead of patching ``os.environ``.
"""

from __future__ import annotations

import hashlib
from collections.abc import Mapping
from pathlib import Path
from urllib.parse import urlsplit

from django.core.exceptions import ImproperlyConfigured

TRUE_WORDS = frozenset({"1", "true", "yes", "on"})
FALSE_WORDS = frozenset({"0", "false", "no", "off"})
ENVIRONMENTS = ("development", "production")

#: Key used only on a developer's machine.  Its text says what it is, and
#: production refuses it (see :func:`deployment_settings`).
DEVELOPMENT_SECRET_KEY = "development-only-key-never-use-in-production-linecast"
DEVELOPMENT_HOSTS = ["localhost", "127.0.0.1", "[::1]"]
MIN_SECRET_KEY_LENGTH = 40


def parse_bool(text: str, name: str) -> bool:
    """Read a yes/no value; anything but the usual spellings is an error naming ``name``."""
    word = text.strip().lower()
    if word in TRUE_WORDS:
        return True
    if word in FALSE_WORDS:
        return False
    choices = ", ".join(sorted(TRUE_WORDS | FALSE_WORDS))
    raise ImproperlyConfigured(f"{name}={text!r} is not a yes/no value; use one of: {choices}")


def env_bool(environ: Mapping[str, str], name: str, default: bool) -> bool:
    """Boolean variable ``name``; unset or empty means ``default``."""
    text = environ.get(name, "")
    return default if not text.strip() else parse_bool(text, name)


def env_list(environ: Mapping[str, str], name: str) -> list[str]:
    """Comma-separated variable ``name`` as a list without blanks (empty when unset)."""
    return [item.strip() for item in environ.get(name, "").split(",") if item.strip()]


def env_int(environ: Mapping[str, str], name: str, default: int, minimum: int = 0) -> int:
    """Integer variable ``name`` >= ``minimum``; unset or empty means ``default``."""
    text = environ.get(name, "").strip()
    if not text:
        return default
    try:
        value = int(text)
    except ValueError:
        raise ImproperlyConfigured(f"{name}={text!r} is not a whole number") from None
    if value < minimum:
        raise ImproperlyConfigured(f"{name}={value} must be >= {minimum}")
    return value


def environment_name(environ: Mapping[str, str]) -> str:
    """Value of LINECAST_ENV: 'development' (the default) or 'production'."""
    name = environ.get("LINECAST_ENV", "").strip().lower() or "development"
    if name not in ENVIRONMENTS:
        raise ImproperlyConfigured(f"LINECAST_ENV={name!r} is unknown; use one of: {', '.join(ENVIRONMENTS)}")
    return name


def deployment_settings(environ: Mapping[str, str]) -> dict:
    """DEBUG, SECRET_KEY, ALLOWED_HOSTS and PRODUCTION for this environment.

    Production is LINECAST_ENV=production or DEBUG set false.  It must get a
    real SECRET_KEY and ALLOWED_HOSTS from the environment: a server that
    started with the development key would sign sessions anyone can forge.
    """
    environment = environment_name(environ)
    debug = env_bool(environ, "DEBUG", default=environment == "development")
    if environment == "production" and debug:
        raise ImproperlyConfigured("DEBUG=true is not allowed with LINECAST_ENV=production")
    production = environment == "production" or not debug
    if not production:
        return {
            "PRODUCTION": False,
            "DEBUG": True,
            "SECRET_KEY": environ.get("SECRET_KEY", "").strip() or DEVELOPMENT_SECRET_KEY,
            "ALLOWED_HOSTS": env_list(environ, "ALLOWED_HOSTS") or list(DEVELOPMENT_HOSTS),
        }
    missing = [name for name in ("SECRET_KEY", "ALLOWED_HOSTS") if not environ.get(name, "").strip()]
    if missing:
        raise ImproperlyConfigured(
            f"Production settings (LINECAST_ENV=production or DEBUG=false) need {' and '.join(missing)} "
            "from the environment; refusing to start without them."
        )
    secret_key = environ["SECRET_KEY"].strip()
    if secret_key == DEVELOPMENT_SECRET_KEY or len(secret_key) < MIN_SECRET_KEY_LENGTH:
        raise ImproperlyConfigured(
            f"SECRET_KEY must be a random value of at least {MIN_SECRET_KEY_LENGTH} characters, "
            "not the development key; generate one with "
            "`python -c 'import secrets; print(secrets.token_urlsafe(50))'`."
        )
    return {
        "PRODUCTION": True,
        "DEBUG": False,
        "SECRET_KEY": secret_key,
        "ALLOWED_HOSTS": env_list(environ, "ALLOWED_HOSTS"),
    }


#: Cache of one process's memory: what development and a single-process server use.
#: 500 entries: a wide-window prediction of a large asymmetric top pickles to about 1 MB, and each
#: gunicorn worker keeps its own copy of this cache.
LOCAL_MEMORY_CACHE = {"BACKEND": "django.core.cache.backends.locmem.LocMemCache", "OPTIONS": {"MAX_ENTRIES": 500}}
REDIS_SCHEMES = ("redis", "rediss")


def cache_settings(environ: Mapping[str, str], name: str = "LINECAST_CACHE_URL") -> dict:
    """CACHES for variable ``name``: this process's memory when unset, a redis server for a redis URL.

    ``redis://[:password@]host[:port][/db]`` (``rediss://`` for TLS) goes to
    Django's own RedisCache, so every gunicorn worker shares one cache.  Other
    schemes are refused: memcached's default 1 MB item limit is below the
    pickled size of a wide prediction, which would then silently never be cached.
    """
    text = environ.get(name, "").strip()
    if not text:
        return {"default": dict(LOCAL_MEMORY_CACHE)}
    url = urlsplit(text)
    # Messages show the URL without its password: start-up errors end up in logs.
    shown = text.replace(f":{url.password}@", ":***@") if url.password else text
    usage = "use redis://host:port/db (rediss:// for TLS), or leave it empty for each process's own memory"
    if url.scheme not in REDIS_SCHEMES:
        raise ImproperlyConfigured(f"{name}={shown!r} has the unknown scheme {url.scheme!r}; {usage}")
    try:
        url.port
    except ValueError:
        raise ImproperlyConfigured(f"{name}={shown!r} has a port that is not a number from 0 to 65535") from None
    if not url.hostname:
        raise ImproperlyConfigured(f"{name}={shown!r} names no host; {usage}")
    database = url.path.strip("/")
    if database and not database.isdigit():
        raise ImproperlyConfigured(f"{name}={shown!r}: the database after the host must be a number, e.g. /0")
    return {
        "default": {
            "BACKEND": "django.core.cache.backends.redis.RedisCache",
            "LOCATION": text,
            # A shared server may hold other programs' keys too.
            "KEY_PREFIX": "linecast",
        }
    }


def code_fingerprint(package_dir: Path) -> str:
    """Short hash of every Python file below ``package_dir``: changes whenever the code does."""
    digest = hashlib.sha256()
    for path in sorted(package_dir.rglob("*.py")):
        digest.update(str(path.relative_to(package_dir)).encode())
        digest.update(path.read_bytes())
    return digest.hexdigest()[:12]
