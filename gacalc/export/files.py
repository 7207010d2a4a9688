"""Writing emitted text to a file so that a reader never sees half of it."""

import os
import tempfile

from .common import ExportError


def _new_file_mode():
    # mkstemp makes files 0600; a new export should get the usual 0666 minus the umask.
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask


def write_atomically(path, text):
    """Write text (UTF-8) to path through a temporary file in the same folder and
    os.replace, so path holds either its old content or all of the new one."""
    path = os.fspath(path)
    folder = os.path.dirname(os.path.abspath(path))
    try:
        mode = os.stat(path).st_mode & 0o7777
    except FileNotFoundError:
        mode = _new_file_mode()
    except OSError as error:
        raise ExportError(f'cannot write {path}: {error.strerror}') from None
    try:
        descriptor, temporary = tempfile.mkstemp(
            dir=folder, prefix='.' + os.path.basename(path) + '.', suffix='.tmp')
    except OSError as error:
        raise ExportError(f'cannot write {path}: {error.strerror}') from None
    try:
        with os.fdopen(descriptor, 'w', encoding='utf-8', newline='') as stream:
            stream.write(text)
            stream.flush()
            os.fsync(stream.fileno())
        os.chmod(temporary, mode)
        os.replace(temporary, path)
    except OSError as error:
        try:
            os.unlink(temporary)
        except OSError:
            pass
        raise ExportError(f'cannot write {path}: {error.strerror}') from None
