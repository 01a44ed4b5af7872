"""A model folder is checked before transformers sees it, so a wrong path is named instead of looked up online."""

import pytest

from engine.model_folder import packaged_encoder_dir, require_model_folder


def test_a_folder_with_config_json_passes_and_a_missing_one_is_named(tmp_path):
    (tmp_path / "config.json").write_text("{}", encoding="utf-8")
    assert require_model_folder(str(tmp_path), "the reader folder") == tmp_path
    with pytest.raises(FileNotFoundError, match=r"the reader folder must be .* \(got .*nowhere\)"):
        require_model_folder(tmp_path / "nowhere", "the reader folder")


def test_the_packaged_encoder_is_a_model_folder():
    assert require_model_folder(packaged_encoder_dir(), "the packaged encoder").is_dir()


def test_the_reader_names_a_missing_folder(tmp_path):
    from engine.reader.transformer_reader import TransformerReader

    with pytest.raises(FileNotFoundError, match="no-reader-here"):
        TransformerReader(tmp_path / "no-reader-here")
