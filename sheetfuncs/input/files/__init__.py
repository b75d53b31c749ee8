"""input/files"""
