"""write_atomically: the file holds the old text or all of the new, never a mix."""

import os
import stat

import pytest

from gacalc.export import ExportError, write_atomically
import gacalc.export.files as files


def leftovers(folder):
    return [p.name for p in folder.iterdir() if p.name.endswith('.tmp')]


def test_writes_new_file_with_umask_mode(tmp_path):
    target = tmp_path / 'kernel.c'
    write_atomically(target, 'int x;\n')
    assert target.read_text() == 'int x;\n'
    umask = os.umask(0)
    os.umask(umask)
    assert stat.S_IMODE(target.stat().st_mode) == 0o666 & ~umask
    assert leftovers(tmp_path) == []


def test_replaces_existing_file_and_keeps_its_mode(tmp_path):
    target = tmp_path / 'rotate.py'
    target.write_text('old\n')
    target.chmod(0o640)
    write_atomically(str(target), 'new θ\n')
    assert target.read_text(encoding='utf-8') == 'new θ\n'
    assert stat.S_IMODE(target.stat().st_mode) == 0o640
    assert leftovers(tmp_path) == []


def test_line_endings_are_written_as_given(tmp_path):
    target = tmp_path / 'a.tex'
    write_atomically(target, 'a\nb\n')
    assert target.read_bytes() == b'a\nb\n'


def test_missing_folder_is_a_one_line_error(tmp_path):
    target = tmp_path / 'no such folder' / 'out.c'
    with pytest.raises(ExportError) as raised:
        write_atomically(target, 'x')
    message = str(raised.value)
    assert '\n' not in message and str(target) in message


def test_failed_replace_keeps_old_content_and_cleans_up(tmp_path, monkeypatch):
    target = tmp_path / 'out.py'
    target.write_text('old\n')

    def refuse(source, destination):
        raise PermissionError(13, 'Permission denied')
    monkeypatch.setattr(files.os, 'replace', refuse)
    with pytest.raises(ExportError):
        write_atomically(target, 'new\n')
    assert target.read_text() == 'old\n'
    assert leftovers(tmp_path) == []
